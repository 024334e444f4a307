import type { MigrationContext } from "../migrate";

// The chain walk is written once: the full verification is the walk from the start (position 0,
// the all-zero genesis hash) that audit_verify_from (0550) performs from any checkpoint.
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    CREATE OR REPLACE FUNCTION audit_verify(p_school uuid)
      RETURNS TABLE (ok boolean, checked bigint, head_hash text, broken_pos bigint, broken_seq bigint, broken_id uuid, problem text)
      LANGUAGE sql STABLE AS $$ SELECT * FROM audit_verify_from(p_school, 0, repeat('0', 64)) $$;
  `);
}

export async function down() {
  // 0300's body is restored by migrating down past 0300; this body gives the same answers.
}
