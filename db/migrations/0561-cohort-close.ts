import type { MigrationContext } from "../migrate";

// A cohort can be closed from a date: it takes no new members from then on, and it is closed
// only once nobody belongs to it on or after that date (the Cohorts page moves them first).
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    ALTER TABLE cohorts ADD COLUMN closed_on date;
    ALTER TABLE cohorts ADD CONSTRAINT cohorts_closed_after_start CHECK (closed_on IS NULL OR closed_on >= starts_on);
    ALTER TABLE cohorts ADD CONSTRAINT cohorts_name_length CHECK (length(btrim(name)) BETWEEN 1 AND 100) NOT VALID;
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    ALTER TABLE cohorts DROP CONSTRAINT IF EXISTS cohorts_name_length;
    ALTER TABLE cohorts DROP CONSTRAINT IF EXISTS cohorts_closed_after_start;
    ALTER TABLE cohorts DROP COLUMN IF EXISTS closed_on;
  `);
}
