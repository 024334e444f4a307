import type { MigrationContext } from "../migrate";

// The Timetable (sessions of a briefing revision and their attendees), the Ground log (append-only
// ground-training entries and the view of the effective entry per student and session), make-up
// items, and personal calendar feed tokens.
//
// Double-booking is refused by the database itself: exclusion constraints on the instructor, the
// room and (through session_attendees, which carries a copy of the session's range and status,
// kept in sync by triggers) each student. Ranges are half-open, so back-to-back sessions are fine,
// and only scheduled sessions take part, so a cancelled one blocks nothing.
export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(`
    CREATE EXTENSION IF NOT EXISTS btree_gist;

    CREATE TABLE training_sessions (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      briefing_id uuid NOT NULL REFERENCES briefings(id),
      briefing_revision_id uuid NOT NULL REFERENCES briefing_revisions(id),
      starts_at timestamptz NOT NULL,
      ends_at timestamptz NOT NULL,
      room text NOT NULL CHECK (length(btrim(room)) BETWEEN 1 AND 100),
      instructor_id uuid NOT NULL REFERENCES people(id),
      cohort_id uuid REFERENCES cohorts(id),
      status text NOT NULL DEFAULT 'scheduled' CHECK (status IN ('scheduled','cancelled')),
      sequence integer NOT NULL DEFAULT 0 CHECK (sequence >= 0),
      cancel_reason text,
      created_by uuid NOT NULL REFERENCES people(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CHECK (ends_at > starts_at),
      CHECK (ends_at - starts_at <= interval '12 hours'),
      CHECK ((status = 'cancelled') = (cancel_reason IS NOT NULL)),
      CONSTRAINT training_sessions_instructor_busy
        EXCLUDE USING gist (instructor_id WITH =, tstzrange(starts_at, ends_at, '[)') WITH &&) WHERE (status = 'scheduled'),
      CONSTRAINT training_sessions_room_busy
        EXCLUDE USING gist (school_id WITH =, (lower(btrim(room))) WITH =, tstzrange(starts_at, ends_at, '[)') WITH &&) WHERE (status = 'scheduled')
    );
    CREATE INDEX training_sessions_school_time_idx ON training_sessions (school_id, starts_at);
    CREATE INDEX training_sessions_cohort_idx ON training_sessions (cohort_id);

    CREATE TABLE session_attendees (
      session_id uuid NOT NULL REFERENCES training_sessions(id),
      student_id uuid NOT NULL REFERENCES people(id),
      via text NOT NULL DEFAULT 'individual' CHECK (via IN ('cohort','individual')),
      -- copies of the session's range and status, kept in sync by triggers, for the constraint below
      starts_at timestamptz NOT NULL,
      ends_at timestamptz NOT NULL,
      status text NOT NULL,
      PRIMARY KEY (session_id, student_id),
      CONSTRAINT session_attendees_student_busy
        EXCLUDE USING gist (student_id WITH =, tstzrange(starts_at, ends_at, '[)') WITH &&) WHERE (status = 'scheduled')
    );
    CREATE INDEX session_attendees_student_idx ON session_attendees (student_id, starts_at);

    -- An attendee row always takes its range and status from its session, whatever the caller wrote.
    CREATE FUNCTION session_attendee_copy() RETURNS trigger LANGUAGE plpgsql AS $fn$
    BEGIN
      SELECT s.starts_at, s.ends_at, s.status INTO NEW.starts_at, NEW.ends_at, NEW.status
        FROM training_sessions s WHERE s.id = NEW.session_id;
      RETURN NEW;
    END $fn$;
    CREATE TRIGGER session_attendees_copy BEFORE INSERT OR UPDATE ON session_attendees
      FOR EACH ROW EXECUTE FUNCTION session_attendee_copy();

    CREATE FUNCTION session_attendee_sync() RETURNS trigger LANGUAGE plpgsql AS $fn$
    BEGIN
      IF (NEW.starts_at, NEW.ends_at, NEW.status) IS DISTINCT FROM (OLD.starts_at, OLD.ends_at, OLD.status) THEN
        UPDATE session_attendees SET starts_at = NEW.starts_at, ends_at = NEW.ends_at, status = NEW.status
         WHERE session_id = NEW.id;
      END IF;
      RETURN NEW;
    END $fn$;
    CREATE TRIGGER training_sessions_sync AFTER UPDATE ON training_sessions
      FOR EACH ROW EXECUTE FUNCTION session_attendee_sync();

    -- The Ground log: append-only. A mistake is corrected by an amendment entry that points at
    -- the entry it replaces; the original stays.
    CREATE TABLE ground_log_entries (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      entry_no bigint GENERATED ALWAYS AS IDENTITY UNIQUE,
      school_id uuid NOT NULL REFERENCES schools(id),
      student_id uuid NOT NULL REFERENCES people(id),
      course_id uuid NOT NULL REFERENCES courses(id),
      session_id uuid NOT NULL REFERENCES training_sessions(id),
      briefing_revision_id uuid NOT NULL REFERENCES briefing_revisions(id),
      syllabus_item_ids uuid[] NOT NULL DEFAULT '{}',
      instructor_id uuid NOT NULL REFERENCES people(id),
      status text NOT NULL CHECK (status IN ('attended','late','left_early','absent_excused','absent')),
      late_minutes integer NOT NULL DEFAULT 0 CHECK (late_minutes >= 0),
      early_minutes integer NOT NULL DEFAULT 0 CHECK (early_minutes >= 0),
      credited_minutes integer NOT NULL CHECK (credited_minutes >= 0 AND credited_minutes <= 720),
      occurred_at timestamptz NOT NULL,
      recorded_at timestamptz NOT NULL DEFAULT now(),
      recorded_by uuid NOT NULL REFERENCES people(id),
      amends_entry_id uuid REFERENCES ground_log_entries(id),
      reason text,
      CHECK (status NOT IN ('absent','absent_excused') OR credited_minutes = 0),
      CHECK (amends_entry_id IS NULL OR length(btrim(coalesce(reason, ''))) > 0)
    );
    -- one original entry per student and session; amendments come after it
    CREATE UNIQUE INDEX ground_log_one_original ON ground_log_entries (student_id, session_id) WHERE amends_entry_id IS NULL;
    CREATE UNIQUE INDEX ground_log_one_amendment_each ON ground_log_entries (amends_entry_id) WHERE amends_entry_id IS NOT NULL;
    CREATE INDEX ground_log_student_idx ON ground_log_entries (student_id, course_id);

    CREATE FUNCTION ground_log_append_only() RETURNS trigger LANGUAGE plpgsql AS $fn$
    BEGIN
      RAISE EXCEPTION 'ground log entries are append-only; record an amendment instead' USING ERRCODE = 'insufficient_privilege';
    END $fn$;
    CREATE TRIGGER ground_log_entries_append_only BEFORE UPDATE OR DELETE ON ground_log_entries
      FOR EACH ROW EXECUTE FUNCTION ground_log_append_only();
    CREATE TRIGGER ground_log_entries_no_truncate BEFORE TRUNCATE ON ground_log_entries
      FOR EACH STATEMENT EXECUTE FUNCTION ground_log_append_only();
    REVOKE UPDATE, DELETE, TRUNCATE ON ground_log_entries FROM ${app};

    -- The effective entry per student and session: the last in its amendment chain.
    CREATE VIEW ground_log_current AS
      SELECT DISTINCT ON (e.student_id, e.session_id)
             e.id AS entry_id, e.school_id, e.student_id, e.course_id, e.session_id, e.briefing_revision_id,
             e.syllabus_item_ids, e.instructor_id, e.status, e.late_minutes, e.early_minutes, e.credited_minutes,
             e.occurred_at, e.recorded_at, e.amends_entry_id, e.reason,
             (SELECT count(*)::int FROM ground_log_entries x WHERE x.student_id = e.student_id AND x.session_id = e.session_id) - 1 AS amendment_count
        FROM ground_log_entries e
       ORDER BY e.student_id, e.session_id, e.entry_no DESC;

    CREATE TABLE makeup_items (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      student_id uuid NOT NULL REFERENCES people(id),
      syllabus_item_id uuid NOT NULL REFERENCES syllabus_items(id),
      source_kind text NOT NULL CHECK (source_kind IN ('absence','stage_check')),
      source_id uuid NOT NULL,
      state text NOT NULL DEFAULT 'open' CHECK (state IN ('open','scheduled','done','waived')),
      scheduled_session_id uuid REFERENCES training_sessions(id),
      closed_by_kind text CHECK (closed_by_kind IN ('session','one_to_one','oral_check','attendance_amended')),
      closed_by_id uuid,
      waived_reason text,
      waived_by uuid REFERENCES people(id),
      note text NOT NULL DEFAULT '',
      created_at timestamptz NOT NULL DEFAULT now(),
      closed_at timestamptz,
      UNIQUE (student_id, syllabus_item_id, source_kind, source_id),
      CHECK ((state = 'waived') = (waived_reason IS NOT NULL)),
      CHECK ((state IN ('done','waived')) = (closed_at IS NOT NULL)),
      CHECK (state <> 'done' OR closed_by_kind IS NOT NULL),
      CHECK (state <> 'scheduled' OR scheduled_session_id IS NOT NULL)
    );
    CREATE INDEX makeup_items_student_idx ON makeup_items (student_id, state);

    -- Personal iCalendar feeds: only a hash of the secret token is kept.
    CREATE TABLE calendar_feeds (
      person_id uuid PRIMARY KEY REFERENCES people(id),
      token_hash text NOT NULL UNIQUE,
      created_at timestamptz NOT NULL DEFAULT now()
    );
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP VIEW IF EXISTS ground_log_current;
    DROP TABLE IF EXISTS calendar_feeds, makeup_items, ground_log_entries, session_attendees, training_sessions CASCADE;
    DROP FUNCTION IF EXISTS ground_log_append_only(), session_attendee_sync(), session_attendee_copy();
  `);
}
