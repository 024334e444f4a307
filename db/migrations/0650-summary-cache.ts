import type { MigrationContext } from "../migrate";

// Scale: the chief's and the instructors' Today summaries (stages waiting for their check, watch
// notes) are aggregates over every current record of the school, about 0.3 s at 10,000 students.
// They are kept per caller in summary_cache and read again while nothing has changed:
// - records_version_seq moves on every statement that writes a table of the school's records (a
//   statement-level trigger on every public table but the mechanical ones listed below), so a
//   cached summary is current while the sequence still stands at the version it was computed at;
// - a sequence is not transactional (no lock between writers); a summary computed in the moment
//   between a writer's statement and its commit can miss that write, so a summary is also dropped
//   60 s after it was computed (SUMMARY_FRESH_MS in db/access/shared/summary-cache.ts).
// Tables added later get the trigger by listing them in a migration of their own; the integration
// test tests/integration/scale/summary-cache.test.ts fails for a public table with neither the
// trigger nor a place in NOT_RECORDS.

/** Tables whose writes never change a summary (queues, tokens, throttles, the cache itself). */
export const NOT_RECORDS = [
  "audit_checkpoints",
  "audit_walks",
  "idempotency_keys",
  "mail_deliveries",
  "mail_jobs",
  "mail_unsubscribes",
  "outbox",
  "schema_migrations",
  "set_password_tokens",
  "sign_in_throttle",
  "summary_cache",
];

export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(`
    CREATE SEQUENCE IF NOT EXISTS records_version_seq;
    GRANT USAGE, SELECT ON SEQUENCE records_version_seq TO ${app};
    CREATE TABLE IF NOT EXISTS summary_cache (
      school_id uuid NOT NULL REFERENCES schools(id) ON DELETE CASCADE,
      key text NOT NULL CHECK (length(key) BETWEEN 1 AND 200),
      version bigint NOT NULL,
      computed_at timestamptz NOT NULL,
      payload jsonb NOT NULL,
      PRIMARY KEY (school_id, key)
    );
    GRANT SELECT, INSERT, UPDATE, DELETE ON summary_cache TO ${app};
    CREATE OR REPLACE FUNCTION records_version_bump() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM nextval('records_version_seq');
      RETURN NULL;
    END $$;
  `);
  const [tables] = (await context.sequelize.query(
    `SELECT tablename FROM pg_tables WHERE schemaname = 'public' AND tablename NOT IN (:skip) ORDER BY tablename`,
    { replacements: { skip: NOT_RECORDS } },
  )) as [{ tablename: string }[], unknown];
  for (const { tablename } of tables) {
    await context.sequelize.query(`
      DROP TRIGGER IF EXISTS records_version_bump ON "${tablename}";
      CREATE TRIGGER records_version_bump AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "${tablename}"
        FOR EACH STATEMENT EXECUTE FUNCTION records_version_bump();
    `);
  }
}

export async function down({ context }: { context: MigrationContext }) {
  const [tables] = (await context.sequelize.query(
    `SELECT DISTINCT c.relname AS tablename FROM pg_trigger t JOIN pg_class c ON c.oid = t.tgrelid WHERE t.tgname = 'records_version_bump'`,
  )) as [{ tablename: string }[], unknown];
  for (const { tablename } of tables) await context.sequelize.query(`DROP TRIGGER IF EXISTS records_version_bump ON "${tablename}";`);
  await context.sequelize.query(`
    DROP FUNCTION IF EXISTS records_version_bump();
    DROP TABLE IF EXISTS summary_cache;
    DROP SEQUENCE IF EXISTS records_version_seq;
  `);
}
