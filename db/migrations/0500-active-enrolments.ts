import type { MigrationContext } from "../migrate";

// "The active enrolment" of a student, defined once: the newest active enrolment (latest
// enrolled_on, then id). Every read that means "the course this student is on now" joins this view.
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    CREATE VIEW active_enrolments AS
      SELECT DISTINCT ON (e.student_id) e.*
        FROM enrolments e
       WHERE e.status = 'active'
       ORDER BY e.student_id, e.enrolled_on DESC, e.id;
    GRANT SELECT ON active_enrolments TO "${context.appRole}";
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`DROP VIEW IF EXISTS active_enrolments`);
}
