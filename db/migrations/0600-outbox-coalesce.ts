import type { MigrationContext } from "../migrate";

// Change notices in a burst become one mail: an outbox row may carry a coalesce key
// (e.g. `session.changed:<session>:<recipient>`). Writing a row with a key marks every unsent row
// with the same key as cancelled and points it at the row that replaces it (`superseded_by`);
// rows are never deleted. Such rows wait a short settle window (their `due_at`) before the worker
// takes them. `coalesce_facts` keeps what the replacing notice must carry over (the time the
// recipient last heard of). Also indexes for the per-person create cap.
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    ALTER TABLE outbox ADD COLUMN coalesce_key text;
    ALTER TABLE outbox ADD COLUMN coalesce_facts jsonb NOT NULL DEFAULT '{}'::jsonb;
    ALTER TABLE outbox ADD COLUMN superseded_by uuid REFERENCES outbox(id);
    ALTER TABLE outbox ADD CONSTRAINT outbox_superseded_is_cancelled CHECK (superseded_by IS NULL OR state = 'cancelled');
    -- at most one unsent notice per key: a second writer waits on the first one's row
    CREATE UNIQUE INDEX outbox_one_pending_per_coalesce_key ON outbox (coalesce_key) WHERE state = 'queued' AND coalesce_key IS NOT NULL;
    -- the per-person create cap (db/access/shared/create-cap.ts) counts a person's recent creates
    CREATE INDEX training_sessions_creator_recent_idx ON training_sessions (created_by, created_at);
    CREATE INDEX assignments_creator_recent_idx ON assignments (assigned_by, created_at);
    CREATE INDEX demos_owner_recent_idx ON demos (owner_id, created_at);
    CREATE INDEX briefings_owner_recent_idx ON briefings (owner_id, created_at);
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP INDEX IF EXISTS briefings_owner_recent_idx, demos_owner_recent_idx, assignments_creator_recent_idx, training_sessions_creator_recent_idx;
    DROP INDEX IF EXISTS outbox_one_pending_per_coalesce_key;
    ALTER TABLE outbox DROP CONSTRAINT IF EXISTS outbox_superseded_is_cancelled;
    ALTER TABLE outbox DROP COLUMN IF EXISTS superseded_by;
    ALTER TABLE outbox DROP COLUMN IF EXISTS coalesce_facts;
    ALTER TABLE outbox DROP COLUMN IF EXISTS coalesce_key;
  `);
}
