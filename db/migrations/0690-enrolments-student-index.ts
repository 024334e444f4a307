import type { MigrationContext } from "../migrate";

// Scale: every enrolment of one student (ended ones too: the end of training, retention, the
// inspection pack) was found by reading the whole table; only the active ones had an index
// (enrolments_one_active). With 10,000 students each such probe read 10,000 rows.
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`CREATE INDEX IF NOT EXISTS enrolments_student_idx ON enrolments (student_id, ended_on DESC);`);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`DROP INDEX IF EXISTS enrolments_student_idx;`);
}
