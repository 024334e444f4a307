import type { MigrationContext } from "../migrate";

// Scale: indexes for the per-session and per-cohort counts and the register's school-wide reads,
// and the audit chain's checkpoint (the last verified position and head of each school's chain),
// so Today verifies only the events written since; a full re-verification stays a deliberate act.
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    CREATE INDEX IF NOT EXISTS session_attendees_session_idx ON session_attendees (session_id);
    CREATE INDEX IF NOT EXISTS cohort_memberships_cohort_idx ON cohort_memberships (cohort_id) WHERE to_date IS NULL;
    CREATE INDEX IF NOT EXISTS cohort_memberships_student_idx ON cohort_memberships (student_id) WHERE to_date IS NULL;
    CREATE INDEX IF NOT EXISTS sign_offs_school_idx ON sign_offs (school_id, signed_on DESC, signed_at DESC);
    CREATE INDEX IF NOT EXISTS sign_offs_student_idx ON sign_offs (student_id, syllabus_item_id, generation DESC);
    CREATE INDEX IF NOT EXISTS stage_checks_school_idx ON stage_checks (school_id, recorded_at DESC);
    CREATE INDEX IF NOT EXISTS oral_checks_school_idx ON oral_checks (school_id, occurred_at);
    CREATE INDEX IF NOT EXISTS makeup_items_student_idx ON makeup_items (student_id) WHERE state IN ('open','scheduled');

    CREATE TABLE audit_checkpoints (
      school_id uuid PRIMARY KEY REFERENCES schools(id),
      chain_pos bigint NOT NULL CHECK (chain_pos >= 0),
      head_hash text NOT NULL CHECK (length(head_hash) = 64),
      verified_at timestamptz NOT NULL
    );

    -- Verifies a school's chain from a checkpoint: the rows after position p_pos, the first of
    -- which must link to p_hash. Reports like audit_verify; "checked" counts from position 1.
    CREATE FUNCTION audit_verify_from(p_school uuid, p_pos bigint, p_hash text)
      RETURNS TABLE (ok boolean, checked bigint, head_hash text, broken_pos bigint, broken_seq bigint, broken_id uuid, problem text)
      LANGUAGE plpgsql STABLE AS $$
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
    GRANT SELECT, INSERT, UPDATE ON audit_checkpoints TO "${context.appRole}";
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP FUNCTION IF EXISTS audit_verify_from(uuid, bigint, text);
    DROP TABLE IF EXISTS audit_checkpoints;
    DROP INDEX IF EXISTS session_attendees_session_idx, cohort_memberships_cohort_idx, cohort_memberships_student_idx,
      sign_offs_school_idx, sign_offs_student_idx, stage_checks_school_idx, oral_checks_school_idx, makeup_items_student_idx;
  `);
}
