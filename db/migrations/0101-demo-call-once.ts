import type { MigrationContext } from "../migrate";

// Call it first is one call per student per demo revision, made before the reveal. Any second
// call stored before this rule (a reload showed a new prompt) is dropped, keeping each student's
// first call; then a unique index makes the database refuse another.
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DELETE FROM demo_calls c
     USING demo_calls first
     WHERE first.demo_revision_id = c.demo_revision_id AND first.student_id = c.student_id
       AND (first.created_at, first.id) < (c.created_at, c.id);
    CREATE UNIQUE INDEX demo_calls_one_per_revision ON demo_calls (demo_revision_id, student_id);
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`DROP INDEX IF EXISTS demo_calls_one_per_revision;`);
}
