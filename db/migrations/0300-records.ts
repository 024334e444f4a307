import type { MigrationContext } from "../migrate";

// Records: oral checks and their questions, sign-offs, stage checks, and the append-only
// audit trail with a hash chain computed in the database.
//
// Append-only by construction: every table here refuses UPDATE, DELETE and TRUNCATE through
// triggers, and the app role has those privileges revoked; the app role owns none of these
// tables, so it cannot disable the triggers. Corrections are new rows that refer to the
// original (amendments, withdrawals, acknowledgements); status is derived from them.
//
// References to other areas' tables (sessions, make-up items) are plain uuids without a
// foreign key, so this migration does not depend on the order in which they land.
const APPEND_ONLY = [
  "audit_events",
  "oral_checks",
  "oral_check_questions",
  "oral_check_withdrawals",
  "oral_check_acknowledgements",
  "sign_offs",
  "sign_off_withdrawals",
  "stage_checks",
];

export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(`
    CREATE TABLE audit_events (
      seq bigint PRIMARY KEY,
      id uuid NOT NULL DEFAULT gen_random_uuid() UNIQUE,
      school_id uuid NOT NULL REFERENCES schools(id),
      chain_pos bigint NOT NULL,
      actor_id uuid REFERENCES people(id),
      actor_roles text[] NOT NULL DEFAULT '{}',
      action text NOT NULL CHECK (length(action) BETWEEN 1 AND 80),
      record_type text NOT NULL,
      record_id uuid NOT NULL,
      before jsonb,
      after jsonb,
      occurred_at timestamptz NOT NULL,
      prev_hash text NOT NULL,
      hash text NOT NULL,
      UNIQUE (school_id, chain_pos)
    );
    CREATE SEQUENCE audit_events_seq OWNED BY audit_events.seq;
    CREATE INDEX audit_events_record_idx ON audit_events (record_type, record_id);

    -- The text a row's hash covers. jsonb prints its keys in a fixed order, and the instant is
    -- printed in UTC with microseconds, so the same row always gives the same text.
    CREATE FUNCTION audit_canonical(e audit_events) RETURNS text LANGUAGE sql IMMUTABLE AS $$
      SELECT concat_ws('|',
        e.school_id::text, e.chain_pos::text, coalesce(e.actor_id::text, '-'), array_to_string(e.actor_roles, ','),
        e.action, e.record_type, e.record_id::text,
        coalesce(e.before::text, 'null'), coalesce(e.after::text, 'null'),
        to_char(e.occurred_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"'))
    $$;

    CREATE FUNCTION audit_hash(prev text, e audit_events) RETURNS text LANGUAGE sql IMMUTABLE AS $$
      SELECT encode(sha256(convert_to(prev || '|' || audit_canonical(e), 'UTF8')), 'hex')
    $$;

    -- Links each new row to the previous row of its school under a per-school transaction lock:
    -- the position and the sequence number are taken only after the lock, so concurrent writers
    -- line up one after the other and the chain cannot fork.
    CREATE FUNCTION audit_events_chain() RETURNS trigger LANGUAGE plpgsql AS $$
    DECLARE
      last audit_events;
    BEGIN
      IF current_setting('transaction_isolation') <> 'read committed' THEN
        RAISE EXCEPTION 'audit events are written in read committed transactions only';
      END IF;
      PERFORM pg_advisory_xact_lock(hashtextextended('audit_events:' || NEW.school_id::text, 0));
      SELECT * INTO last FROM audit_events WHERE school_id = NEW.school_id ORDER BY chain_pos DESC LIMIT 1;
      NEW.seq := nextval('audit_events_seq');
      NEW.chain_pos := coalesce(last.chain_pos, 0) + 1;
      NEW.occurred_at := coalesce(NEW.occurred_at, now());
      NEW.prev_hash := coalesce(last.hash, repeat('0', 64));
      NEW.hash := audit_hash(NEW.prev_hash, NEW);
      RETURN NEW;
    END
    $$;
    CREATE TRIGGER audit_events_chain BEFORE INSERT ON audit_events FOR EACH ROW EXECUTE FUNCTION audit_events_chain();

    -- Walks a school's chain in order and reports the first broken link, or nothing.
    CREATE FUNCTION audit_verify(p_school uuid)
      RETURNS TABLE (ok boolean, checked bigint, head_hash text, broken_pos bigint, broken_seq bigint, broken_id uuid, problem text)
      LANGUAGE plpgsql STABLE AS $$
    DECLARE
      e audit_events;
      prev text := repeat('0', 64);
      expected_pos bigint := 1;
      n bigint := 0;
    BEGIN
      FOR e IN SELECT * FROM audit_events WHERE school_id = p_school ORDER BY chain_pos, seq LOOP
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

    CREATE TABLE oral_checks (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      student_id uuid NOT NULL REFERENCES people(id),
      enrolment_id uuid NOT NULL REFERENCES enrolments(id),
      instructor_id uuid NOT NULL REFERENCES people(id),
      session_id uuid,
      level_shown text NOT NULL CHECK (level_shown IN ('rote','understanding','application','correlation')),
      remarks text NOT NULL DEFAULT '' CHECK (length(remarks) <= 4000),
      duration_minutes integer NOT NULL CHECK (duration_minutes BETWEEN 1 AND 600),
      occurred_at timestamptz NOT NULL,
      recorded_at timestamptz NOT NULL,
      outcome text NOT NULL CHECK (outcome IN ('meets','not_yet')),
      outcome_rule jsonb NOT NULL,
      item_outcomes jsonb NOT NULL,
      amends_id uuid REFERENCES oral_checks(id),
      amend_reason text,
      CHECK ((amends_id IS NULL) = (amend_reason IS NULL)),
      CHECK (occurred_at <= recorded_at + interval '5 minutes')
    );
    CREATE UNIQUE INDEX oral_checks_one_amendment ON oral_checks (amends_id) WHERE amends_id IS NOT NULL;
    CREATE INDEX oral_checks_student_idx ON oral_checks (student_id, occurred_at);

    CREATE TABLE oral_check_items (
      check_id uuid NOT NULL REFERENCES oral_checks(id),
      syllabus_item_id uuid NOT NULL REFERENCES syllabus_items(id),
      PRIMARY KEY (check_id, syllabus_item_id)
    );
    CREATE INDEX oral_check_items_item_idx ON oral_check_items (syllabus_item_id);

    CREATE TABLE oral_check_questions (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      check_id uuid NOT NULL REFERENCES oral_checks(id),
      position integer NOT NULL CHECK (position > 0),
      syllabus_item_id uuid NOT NULL REFERENCES syllabus_items(id),
      item_code text NOT NULL,
      question_text text NOT NULL CHECK (length(question_text) BETWEEN 1 AND 2000),
      answer_summary text NOT NULL DEFAULT '' CHECK (length(answer_summary) <= 2000),
      outcome text NOT NULL CHECK (outcome IN ('solid','shaky','not_yet')),
      required boolean NOT NULL DEFAULT true,
      prompted boolean NOT NULL DEFAULT false,
      corrective_given boolean NOT NULL DEFAULT false,
      generated jsonb,
      student_figure double precision,
      UNIQUE (check_id, position)
    );
    CREATE INDEX oral_check_questions_item_idx ON oral_check_questions (syllabus_item_id);

    CREATE TABLE oral_check_withdrawals (
      check_id uuid PRIMARY KEY REFERENCES oral_checks(id),
      withdrawn_by uuid NOT NULL REFERENCES people(id),
      reason text NOT NULL CHECK (length(reason) BETWEEN 3 AND 2000),
      withdrawn_at timestamptz NOT NULL
    );

    CREATE TABLE oral_check_acknowledgements (
      check_id uuid PRIMARY KEY REFERENCES oral_checks(id),
      student_id uuid NOT NULL REFERENCES people(id),
      acknowledged_at timestamptz NOT NULL
    );

    -- At most one current sign-off per student and item, without a stored status: each
    -- sign-off of a student and item has a generation number, unique per pair; a new generation
    -- is allowed only when the previous one was withdrawn or is amended by the new row. Fifty
    -- concurrent first attempts all ask for generation 1, and the unique index lets one through.
    CREATE TABLE sign_offs (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      student_id uuid NOT NULL REFERENCES people(id),
      syllabus_item_id uuid NOT NULL REFERENCES syllabus_items(id),
      enrolment_id uuid NOT NULL REFERENCES enrolments(id),
      generation integer NOT NULL CHECK (generation > 0),
      basis_check_id uuid NOT NULL REFERENCES oral_checks(id),
      signer_id uuid NOT NULL REFERENCES people(id),
      statement text NOT NULL,
      signed_on date NOT NULL,
      signed_at timestamptz NOT NULL,
      signature_hash text NOT NULL,
      amends_id uuid REFERENCES sign_offs(id),
      amend_reason text,
      CHECK ((amends_id IS NULL) = (amend_reason IS NULL)),
      UNIQUE (student_id, syllabus_item_id, generation)
    );
    CREATE UNIQUE INDEX sign_offs_one_amendment ON sign_offs (amends_id) WHERE amends_id IS NOT NULL;

    CREATE TABLE sign_off_withdrawals (
      sign_off_id uuid PRIMARY KEY REFERENCES sign_offs(id),
      withdrawn_by uuid NOT NULL REFERENCES people(id),
      reason text NOT NULL CHECK (length(reason) BETWEEN 3 AND 2000),
      withdrawn_at timestamptz NOT NULL
    );

    CREATE FUNCTION sign_offs_generation_guard() RETURNS trigger LANGUAGE plpgsql AS $$
    DECLARE
      prev sign_offs;
    BEGIN
      IF NEW.generation = 1 THEN
        IF NEW.amends_id IS NOT NULL THEN RAISE EXCEPTION 'an amendment cannot be the first sign-off'; END IF;
        RETURN NEW;
      END IF;
      SELECT * INTO prev FROM sign_offs
        WHERE student_id = NEW.student_id AND syllabus_item_id = NEW.syllabus_item_id AND generation = NEW.generation - 1;
      IF NOT FOUND THEN RAISE EXCEPTION 'sign-off generation % has no predecessor', NEW.generation; END IF;
      IF NEW.amends_id IS NOT NULL THEN
        IF NEW.amends_id <> prev.id THEN RAISE EXCEPTION 'an amendment must refer to the current sign-off'; END IF;
      ELSIF NOT EXISTS (SELECT 1 FROM sign_off_withdrawals w WHERE w.sign_off_id = prev.id) THEN
        RAISE EXCEPTION 'the previous sign-off is still current';
      END IF;
      RETURN NEW;
    END
    $$;
    CREATE TRIGGER sign_offs_generation_guard BEFORE INSERT ON sign_offs FOR EACH ROW EXECUTE FUNCTION sign_offs_generation_guard();

    CREATE TABLE stage_checks (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      student_id uuid NOT NULL REFERENCES people(id),
      enrolment_id uuid NOT NULL REFERENCES enrolments(id),
      stage_id uuid NOT NULL REFERENCES syllabus_stages(id),
      attempt integer NOT NULL CHECK (attempt > 0),
      examiner_id uuid NOT NULL REFERENCES people(id),
      lead_instructor_id uuid REFERENCES people(id),
      override_reason text,
      result text NOT NULL CHECK (result IN ('pass','fail')),
      oral_outcomes jsonb NOT NULL,
      written_score_percent numeric(5,2) CHECK (written_score_percent BETWEEN 0 AND 100),
      pass_mark_percent numeric(5,2) NOT NULL,
      remarks text NOT NULL DEFAULT '',
      occurred_at timestamptz NOT NULL,
      recorded_at timestamptz NOT NULL,
      signature_hash text NOT NULL,
      UNIQUE (student_id, stage_id, attempt)
    );

    CREATE FUNCTION records_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION '% is append-only: % refused', TG_TABLE_NAME, TG_OP USING ERRCODE = 'insufficient_privilege';
    END
    $$;
  `);
  for (const table of [...APPEND_ONLY, "oral_check_items"]) {
    await context.sequelize.query(`
      CREATE TRIGGER ${table}_no_update BEFORE UPDATE OR DELETE ON ${table} FOR EACH ROW EXECUTE FUNCTION records_refuse_change();
      CREATE TRIGGER ${table}_no_truncate BEFORE TRUNCATE ON ${table} FOR EACH STATEMENT EXECUTE FUNCTION records_refuse_change();
      REVOKE UPDATE, DELETE, TRUNCATE ON ${table} FROM ${app};
      GRANT SELECT, INSERT ON ${table} TO ${app};
    `);
  }
  await context.sequelize.query(`GRANT USAGE, SELECT ON SEQUENCE audit_events_seq TO ${app};`);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP TABLE IF EXISTS stage_checks, sign_off_withdrawals, sign_offs, oral_check_acknowledgements, oral_check_withdrawals,
      oral_check_questions, oral_check_items, oral_checks, audit_events CASCADE;
    DROP FUNCTION IF EXISTS records_refuse_change(), sign_offs_generation_guard(), audit_verify(uuid), audit_events_chain(),
      audit_hash(text, audit_events), audit_canonical(audit_events);
  `);
}
