import type { MigrationContext } from "../migrate";

// The planned end of an enrolment: the date the student means to finish the course by. "Am I on
// track?" compares the credited ground hours with the minimum pro-rated from the enrolment date to
// this date (lib/progress/on-track.ts). Enrolments made before it existed get six months (182
// days) from their enrolment date; the school may set another date. The view active_enrolments
// (0500) selects e.*, expanded when it was made, so it is made again to carry the new column.
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    ALTER TABLE enrolments ADD COLUMN planned_end_on date;
    UPDATE enrolments SET planned_end_on = enrolled_on + 182 WHERE planned_end_on IS NULL;
    ALTER TABLE enrolments ADD CONSTRAINT enrolments_planned_end_after_start CHECK (planned_end_on IS NULL OR planned_end_on > enrolled_on);
    CREATE OR REPLACE VIEW active_enrolments AS
      SELECT DISTINCT ON (e.student_id) e.*
        FROM enrolments e
       WHERE e.status = 'active'
       ORDER BY e.student_id, e.enrolled_on DESC, e.id;
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP VIEW IF EXISTS active_enrolments;
    ALTER TABLE enrolments DROP COLUMN IF EXISTS planned_end_on;
    CREATE VIEW active_enrolments AS
      SELECT DISTINCT ON (e.student_id) e.*
        FROM enrolments e
       WHERE e.status = 'active'
       ORDER BY e.student_id, e.enrolled_on DESC, e.id;
    GRANT SELECT ON active_enrolments TO "${context.appRole}";
  `);
}
