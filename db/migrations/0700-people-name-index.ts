import type { MigrationContext } from "../migrate";

// Scale: lists of a school's people in name order that stop after a page (the pickers' first 51
// students, the transfer choices) walk this index and stop, instead of sorting every person of the
// school: 1 ms against 24–36 ms for a picker at 10,000 students.
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`CREATE INDEX IF NOT EXISTS people_school_name_idx ON people (school_id, name, id);`);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`DROP INDEX IF EXISTS people_school_name_idx;`);
}
