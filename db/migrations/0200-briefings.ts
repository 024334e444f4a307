import type { MigrationContext } from "../migrate";

// Briefings (lesson plans) as a parent plus numbered immutable revisions, their syllabus items,
// demos and handouts (bytes in PostgreSQL so any instance serves them), assignments and their
// completions. Also guards the foundation's syllabus revisions: a revision that anything refers
// to (an enrolment, a briefing revision) can no longer be changed or deleted.
//
// Curve Lab's `demos` / `demo_revisions` (migration 0100) may not exist when this runs on an
// older database; the foreign keys to them are added only when those tables are present.
export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(`
    CREATE TABLE briefings (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      course_id uuid NOT NULL REFERENCES courses(id),
      owner_id uuid NOT NULL REFERENCES people(id),
      current_revision_id uuid,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX briefings_school_idx ON briefings (school_id);

    CREATE TABLE briefing_revisions (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      briefing_id uuid NOT NULL REFERENCES briefings(id),
      number integer NOT NULL CHECK (number > 0),
      title text NOT NULL CHECK (length(title) BETWEEN 1 AND 200),
      objective text NOT NULL,
      -- ordered elements: [{ title, instructorActions, studentActions, minutes }]
      elements jsonb NOT NULL DEFAULT '[]'::jsonb CHECK (jsonb_typeof(elements) = 'array'),
      equipment text NOT NULL DEFAULT '',
      completion_standard text NOT NULL,
      syllabus_revision_id uuid NOT NULL REFERENCES syllabus_revisions(id),
      change_note text NOT NULL DEFAULT '',
      created_by uuid NOT NULL REFERENCES people(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (briefing_id, number)
    );
    ALTER TABLE briefings ADD CONSTRAINT briefings_current_revision_fk
      FOREIGN KEY (current_revision_id) REFERENCES briefing_revisions(id) DEFERRABLE INITIALLY DEFERRED;

    CREATE TABLE briefing_revision_items (
      briefing_revision_id uuid NOT NULL REFERENCES briefing_revisions(id),
      syllabus_item_id uuid NOT NULL REFERENCES syllabus_items(id),
      PRIMARY KEY (briefing_revision_id, syllabus_item_id)
    );
    CREATE INDEX briefing_revision_items_item_idx ON briefing_revision_items (syllabus_item_id);

    CREATE TABLE briefing_revision_demos (
      briefing_revision_id uuid NOT NULL REFERENCES briefing_revisions(id),
      demo_revision_id uuid NOT NULL,
      position integer NOT NULL DEFAULT 1,
      PRIMARY KEY (briefing_revision_id, demo_revision_id)
    );

    CREATE TABLE handouts (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      briefing_id uuid NOT NULL REFERENCES briefings(id),
      file_name text NOT NULL CHECK (length(file_name) BETWEEN 1 AND 255),
      content_type text NOT NULL CHECK (content_type IN ('application/pdf','image/png','image/jpeg')),
      byte_size integer NOT NULL CHECK (byte_size > 0 AND byte_size <= 10485760),
      sha256 text NOT NULL,
      content bytea NOT NULL,
      uploaded_by uuid NOT NULL REFERENCES people(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      CHECK (octet_length(content) = byte_size)
    );
    CREATE INDEX handouts_briefing_idx ON handouts (briefing_id);

    -- which handouts each briefing revision hands out
    CREATE TABLE briefing_revision_handouts (
      briefing_revision_id uuid NOT NULL REFERENCES briefing_revisions(id),
      handout_id uuid NOT NULL REFERENCES handouts(id),
      position integer NOT NULL DEFAULT 1,
      PRIMARY KEY (briefing_revision_id, handout_id)
    );
    CREATE INDEX briefing_revision_handouts_handout_idx ON briefing_revision_handouts (handout_id);

    CREATE TABLE assignments (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      kind text NOT NULL CHECK (kind IN ('briefing','demo')),
      briefing_id uuid REFERENCES briefings(id),
      demo_id uuid,
      cohort_id uuid REFERENCES cohorts(id),
      student_id uuid REFERENCES people(id),
      due_on date NOT NULL,
      note text NOT NULL DEFAULT '',
      assigned_by uuid NOT NULL REFERENCES people(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      CHECK ((kind = 'briefing') = (briefing_id IS NOT NULL)),
      CHECK ((kind = 'demo') = (demo_id IS NOT NULL)),
      CHECK (num_nonnulls(briefing_id, demo_id) = 1),
      CHECK (num_nonnulls(cohort_id, student_id) = 1)
    );
    CREATE INDEX assignments_school_idx ON assignments (school_id, due_on);
    CREATE INDEX assignments_cohort_idx ON assignments (cohort_id) WHERE cohort_id IS NOT NULL;
    CREATE INDEX assignments_student_idx ON assignments (student_id) WHERE student_id IS NOT NULL;

    CREATE TABLE assignment_completions (
      assignment_id uuid NOT NULL REFERENCES assignments(id) ON DELETE CASCADE,
      student_id uuid NOT NULL REFERENCES people(id),
      completed_at timestamptz NOT NULL,
      PRIMARY KEY (assignment_id, student_id)
    );

    -- Revisions are immutable: a change is a new revision.
    CREATE FUNCTION briefing_revision_immutable() RETURNS trigger LANGUAGE plpgsql AS $fn$
    BEGIN
      RAISE EXCEPTION 'briefing revisions are immutable; make a new revision' USING ERRCODE = 'check_violation';
    END $fn$;
    CREATE TRIGGER briefing_revisions_no_update BEFORE UPDATE ON briefing_revisions
      FOR EACH ROW EXECUTE FUNCTION briefing_revision_immutable();
    CREATE TRIGGER briefing_revision_items_no_update BEFORE UPDATE ON briefing_revision_items
      FOR EACH ROW EXECUTE FUNCTION briefing_revision_immutable();
    CREATE TRIGGER briefing_revision_demos_no_update BEFORE UPDATE ON briefing_revision_demos
      FOR EACH ROW EXECUTE FUNCTION briefing_revision_immutable();
    CREATE TRIGGER briefing_revision_handouts_no_update BEFORE UPDATE ON briefing_revision_handouts
      FOR EACH ROW EXECUTE FUNCTION briefing_revision_immutable();
    CREATE TRIGGER handouts_no_update BEFORE UPDATE ON handouts
      FOR EACH ROW EXECUTE FUNCTION briefing_revision_immutable();
    REVOKE UPDATE, TRUNCATE ON briefing_revisions, briefing_revision_items, briefing_revision_demos,
      briefing_revision_handouts, handouts FROM ${app};

    -- A syllabus revision that anything refers to is frozen: no change to it, its stages or items.
    CREATE FUNCTION syllabus_revision_referenced(rev uuid) RETURNS text LANGUAGE sql STABLE AS $fn$
      SELECT CASE
        WHEN EXISTS (SELECT 1 FROM enrolments WHERE revision_id = rev) THEN 'enrolments'
        WHEN EXISTS (SELECT 1 FROM briefing_revisions WHERE syllabus_revision_id = rev) THEN 'briefing revisions'
        ELSE NULL END
    $fn$;
    CREATE FUNCTION syllabus_revision_frozen() RETURNS trigger LANGUAGE plpgsql AS $fn$
    DECLARE
      rev uuid;
      why text;
    BEGIN
      IF TG_TABLE_NAME = 'syllabus_revisions' THEN rev := OLD.id; ELSE rev := OLD.revision_id; END IF;
      why := syllabus_revision_referenced(rev);
      IF why IS NOT NULL THEN
        RAISE EXCEPTION 'syllabus revision % is referenced by %; make a new revision instead', rev, why
          USING ERRCODE = 'check_violation';
      END IF;
      IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
      RETURN NEW;
    END $fn$;
    CREATE TRIGGER syllabus_revisions_frozen BEFORE UPDATE OR DELETE ON syllabus_revisions
      FOR EACH ROW EXECUTE FUNCTION syllabus_revision_frozen();
    CREATE TRIGGER syllabus_stages_frozen BEFORE UPDATE OR DELETE ON syllabus_stages
      FOR EACH ROW EXECUTE FUNCTION syllabus_revision_frozen();
    CREATE TRIGGER syllabus_items_frozen BEFORE UPDATE OR DELETE ON syllabus_items
      FOR EACH ROW EXECUTE FUNCTION syllabus_revision_frozen();

    -- Curve Lab's tables, when they exist (0100 runs first on a fresh database).
    DO $do$
    BEGIN
      IF to_regclass('public.demo_revisions') IS NOT NULL THEN
        ALTER TABLE briefing_revision_demos ADD CONSTRAINT briefing_revision_demos_demo_revision_fk
          FOREIGN KEY (demo_revision_id) REFERENCES demo_revisions(id);
      END IF;
      IF to_regclass('public.demos') IS NOT NULL THEN
        ALTER TABLE assignments ADD CONSTRAINT assignments_demo_fk FOREIGN KEY (demo_id) REFERENCES demos(id);
      END IF;
    END $do$;
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP TRIGGER IF EXISTS syllabus_revisions_frozen ON syllabus_revisions;
    DROP TRIGGER IF EXISTS syllabus_stages_frozen ON syllabus_stages;
    DROP TRIGGER IF EXISTS syllabus_items_frozen ON syllabus_items;
    DROP TABLE IF EXISTS assignment_completions, assignments, briefing_revision_handouts, handouts,
      briefing_revision_demos, briefing_revision_items, briefing_revisions, briefings CASCADE;
    DROP FUNCTION IF EXISTS syllabus_revision_frozen(), syllabus_revision_referenced(uuid), briefing_revision_immutable();
  `);
}
