import type { MigrationContext } from "../migrate";

// The full walk of a school's audit chain as a deliberate, backgrounded act (the chain page shows
// the checkpoint verification on every visit and the latest walk's result):
// - audit_walks: one row per walk asked for, with its progress (`checked` of `total`, the hash at
//   the checked position, so a walk interrupted by a worker's death resumes where it stopped) and
//   its result; at most one walk of a school is queued or running (a partial unique index), so a
//   second request returns the running walk;
// - audit_verify_range(school, pos, hash, to): the walk of positions pos+1 .. to from a known hash,
//   one batch of the background walk. audit_verify_from (0550), and so audit_verify (0610), become
//   the same walk without an upper bound, so the chain is still checked by one body of code;
// - the pg-boss queue `audit.walk`, made here by the owner role as 0401 made `mail.send`.
export const AUDIT_WALK_QUEUE = "audit.walk";

const RANGE_BODY = `
    DECLARE
      e audit_events;
      prev text := p_hash;
      expected_pos bigint := p_pos + 1;
      n bigint := p_pos;
      nxt audit_events;
    BEGIN
      -- every copy of a position lies in one range (the range is by position, not a row count), so
      -- a duplicated position is found whichever batch holds it
      FOR e IN SELECT * FROM audit_events WHERE school_id = p_school AND chain_pos > p_pos AND chain_pos <= p_to ORDER BY chain_pos, seq LOOP
        IF e.chain_pos <> expected_pos THEN
          RETURN QUERY SELECT false, n, prev, expected_pos, e.seq, e.id,
            CASE WHEN e.chain_pos > expected_pos THEN format('row at position %s is missing (next row found is %s)', expected_pos, e.chain_pos)
                 ELSE format('position %s appears twice', e.chain_pos) END;
          RETURN;
        END IF;
        IF e.prev_hash <> prev THEN
          RETURN QUERY SELECT false, n, prev, e.chain_pos, e.seq, e.id, format('row at position %s does not link to the row before it', e.chain_pos);
          RETURN;
        END IF;
        IF e.hash <> audit_hash(prev, e) THEN
          RETURN QUERY SELECT false, n, prev, e.chain_pos, e.seq, e.id, format('row at position %s was changed after it was written', e.chain_pos);
          RETURN;
        END IF;
        prev := e.hash;
        expected_pos := expected_pos + 1;
        n := n + 1;
      END LOOP;
      -- the rows of the range ended before its last position: a later row means the positions
      -- between are missing; no later row means the chain ends at n (the caller knows whether it
      -- should reach further)
      IF n < p_to THEN
        SELECT * INTO nxt FROM audit_events WHERE school_id = p_school AND chain_pos > n ORDER BY chain_pos, seq LIMIT 1;
        IF FOUND THEN
          RETURN QUERY SELECT false, n, prev, expected_pos, nxt.seq, nxt.id,
            format('row at position %s is missing (next row found is %s)', expected_pos, nxt.chain_pos);
          RETURN;
        END IF;
      END IF;
      RETURN QUERY SELECT true, n, prev, NULL::bigint, NULL::bigint, NULL::uuid, NULL::text;
    END`;

const RESULT = `TABLE (ok boolean, checked bigint, head_hash text, broken_pos bigint, broken_seq bigint, broken_id uuid, problem text)`;

export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(`
    CREATE TABLE audit_walks (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      requested_by uuid REFERENCES people(id),
      requested_at timestamptz NOT NULL,
      state text NOT NULL DEFAULT 'queued' CHECK (state IN ('queued', 'running', 'ok', 'broken', 'failed')),
      -- the head when the walk was asked for (the newest position, or the checkpoint's if higher)
      total bigint NOT NULL CHECK (total >= 0),
      checkpoint_pos bigint,
      checkpoint_hash text,
      checked bigint NOT NULL DEFAULT 0 CHECK (checked >= 0),
      checked_hash text NOT NULL DEFAULT repeat('0', 64),
      started_at timestamptz,
      updated_at timestamptz,
      finished_at timestamptz,
      broken_pos bigint,
      broken_seq bigint,
      broken_id uuid,
      problem text,
      failure text,
      job_id uuid
    );
    CREATE UNIQUE INDEX audit_walks_one_live ON audit_walks (school_id) WHERE state IN ('queued', 'running');
    CREATE INDEX audit_walks_latest ON audit_walks (school_id, requested_at DESC, id DESC);
    GRANT SELECT, INSERT, UPDATE ON audit_walks TO ${app};
    REVOKE DELETE, TRUNCATE ON audit_walks FROM ${app};

    CREATE FUNCTION audit_verify_range(p_school uuid, p_pos bigint, p_hash text, p_to bigint)
      RETURNS ${RESULT} LANGUAGE plpgsql STABLE AS $$ ${RANGE_BODY} $$;
    CREATE OR REPLACE FUNCTION audit_verify_from(p_school uuid, p_pos bigint, p_hash text)
      RETURNS ${RESULT}
      LANGUAGE sql STABLE AS $$ SELECT * FROM audit_verify_range(p_school, p_pos, p_hash, 9223372036854775807) $$;
  `);
  await context.sequelize.query(`SELECT pgboss.create_queue(:name, :options::json)`, {
    replacements: {
      name: AUDIT_WALK_QUEUE,
      options: JSON.stringify({
        policy: "standard",
        retryLimit: 3,
        retryDelay: 5,
        retryBackoff: true,
        // one job walks the whole chain; a job still active after this long (its worker died) is retried
        expireInSeconds: 900,
        retentionMinutes: 60 * 24 * 14,
      }),
    },
  });
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`SELECT pgboss.delete_queue(:name)`, { replacements: { name: AUDIT_WALK_QUEUE } });
  // audit_verify_from gets its own loop back (0550's body: the walk without an upper bound)
  await context.sequelize.query(`
    CREATE OR REPLACE FUNCTION audit_verify_from(p_school uuid, p_pos bigint, p_hash text)
      RETURNS ${RESULT} LANGUAGE plpgsql STABLE AS $$
    DECLARE
      e audit_events;
      prev text := p_hash;
      expected_pos bigint := p_pos + 1;
      n bigint := p_pos;
    BEGIN
      FOR e IN SELECT * FROM audit_events WHERE school_id = p_school AND chain_pos > p_pos ORDER BY chain_pos, seq LOOP
        IF e.chain_pos <> expected_pos THEN
          RETURN QUERY SELECT false, n, prev, expected_pos, e.seq, e.id,
            CASE WHEN e.chain_pos > expected_pos THEN format('row at position %s is missing (next row found is %s)', expected_pos, e.chain_pos)
                 ELSE format('position %s appears twice', e.chain_pos) END;
          RETURN;
        END IF;
        IF e.prev_hash <> prev THEN
          RETURN QUERY SELECT false, n, prev, e.chain_pos, e.seq, e.id, format('row at position %s does not link to the row before it', e.chain_pos);
          RETURN;
        END IF;
        IF e.hash <> audit_hash(prev, e) THEN
          RETURN QUERY SELECT false, n, prev, e.chain_pos, e.seq, e.id, format('row at position %s was changed after it was written', e.chain_pos);
          RETURN;
        END IF;
        prev := e.hash;
        expected_pos := expected_pos + 1;
        n := n + 1;
      END LOOP;
      RETURN QUERY SELECT true, n, prev, NULL::bigint, NULL::bigint, NULL::uuid, NULL::text;
    END
    $$;
    DROP FUNCTION IF EXISTS audit_verify_range(uuid, bigint, text, bigint);
    DROP TABLE IF EXISTS audit_walks;
  `);
}
