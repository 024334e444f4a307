import PgBoss from "pg-boss";
import type { MigrationContext } from "../migrate";

// The mail queue: pg-boss 10 in its own schema `pgboss`, created here by the owner role (which
// may create schemas and tables), with the `mail.send` queue made ahead (v10 keeps one partition
// table per queue, created by DDL). The worker connects as the app role with `migrate: false`: it
// only reads and writes the queue's rows, never changes its schema.
export const MAIL_QUEUE = "mail.send";

export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(PgBoss.getConstructionPlans("pgboss"));
  await context.sequelize.query(`SELECT pgboss.create_queue(:name, :options::json)`, {
    replacements: {
      name: MAIL_QUEUE,
      options: JSON.stringify({
        policy: "standard",
        retryLimit: 8,
        retryDelay: 30,
        retryBackoff: true,
        expireInSeconds: 120,
        retentionMinutes: 60 * 24 * 14,
      }),
    },
  });
  await context.sequelize.query(`
    GRANT USAGE ON SCHEMA pgboss TO ${app};
    GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA pgboss TO ${app};
    GRANT EXECUTE ON ALL FUNCTIONS IN SCHEMA pgboss TO ${app};
    ALTER DEFAULT PRIVILEGES IN SCHEMA pgboss GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO ${app};

    -- Which outbox rows are in the queue, and as which job: the mover writes this row and the
    -- pg-boss job in one transaction, so a crash leaves both or neither.
    CREATE TABLE mail_jobs (
      outbox_id uuid PRIMARY KEY REFERENCES outbox(id),
      job_id uuid NOT NULL,
      queued_at timestamptz NOT NULL DEFAULT now()
    );
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`DROP TABLE IF EXISTS mail_jobs; DROP SCHEMA IF EXISTS pgboss CASCADE;`);
}
