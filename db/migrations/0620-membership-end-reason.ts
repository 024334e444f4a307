import type { MigrationContext } from "../migrate";

// Withdrawing a student from a cohort: the membership ends on a date with the reason kept beside it
// (a move between cohorts ends a membership without one). A reason belongs only to an ended membership.
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    ALTER TABLE cohort_memberships ADD COLUMN end_reason text;
    ALTER TABLE cohort_memberships ADD CONSTRAINT cohort_memberships_end_reason_ended
      CHECK (end_reason IS NULL OR (to_date IS NOT NULL AND length(end_reason) BETWEEN 3 AND 2000));
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    ALTER TABLE cohort_memberships DROP CONSTRAINT IF EXISTS cohort_memberships_end_reason_ended;
    ALTER TABLE cohort_memberships DROP COLUMN IF EXISTS end_reason;
  `);
}
