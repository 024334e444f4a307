import type { MigrationContext } from "../migrate";

// Scale: the endorsement log is kept for years (never pruned) and listed a page at a time, newest
// first; read in that order from this index, its first pages stop after their rows instead of
// sorting every endorsement of the school. (Transfer credits are read newest first from
// transfer_credits_school, migration 0630.)
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(
    `CREATE INDEX IF NOT EXISTS knowledge_test_endorsements_log_order_idx
       ON knowledge_test_endorsements (school_id, endorsed_on DESC, created_at DESC, id DESC);`,
  );
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`DROP INDEX IF EXISTS knowledge_test_endorsements_log_order_idx;`);
}
