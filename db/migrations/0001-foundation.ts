import type { MigrationContext } from "../migrate";

// Cross-cutting tables: schools, people and roles, instructor qualifications, courses,
// syllabus revisions, cohorts, enrolments, sponsor links, sign-in throttle, idempotency
// keys and the transactional outbox. Instants are timestamptz, calendar dates are date.
export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(`
    CREATE EXTENSION IF NOT EXISTS btree_gist;

    -- The app role reads and writes; it owns nothing, so it cannot drop or disable triggers.
    GRANT USAGE ON SCHEMA public TO ${app};
    ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO ${app};
    ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT USAGE, SELECT ON SEQUENCES TO ${app};
    ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT EXECUTE ON FUNCTIONS TO ${app};

    CREATE TABLE schools (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 200),
      time_zone text NOT NULL,
      settings jsonb NOT NULL DEFAULT '{}'::jsonb,
      created_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE people (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 200),
      email text NOT NULL CHECK (position('@' in email) > 1),
      password_hash text,
      roles text[] NOT NULL CHECK (cardinality(roles) > 0 AND roles <@ ARRAY['chief','instructor','student','sponsor']::text[]),
      session_version integer NOT NULL DEFAULT 1,
      active boolean NOT NULL DEFAULT true,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX people_email_unique ON people (lower(email));
    CREATE INDEX people_school_idx ON people (school_id);

    CREATE TABLE courses (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      code text NOT NULL,
      title text NOT NULL,
      min_ground_minutes integer NOT NULL CHECK (min_ground_minutes >= 0),
      created_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (school_id, code)
    );

    CREATE TABLE instructor_qualifications (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      person_id uuid NOT NULL REFERENCES people(id),
      certificate_kind text NOT NULL,
      certificate_number text NOT NULL,
      ratings text[] NOT NULL DEFAULT '{}',
      check_instructor boolean NOT NULL DEFAULT false,
      issued_on date NOT NULL,
      recency_on date NOT NULL,
      recency_months integer NOT NULL DEFAULT 24 CHECK (recency_months > 0),
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX instructor_qualifications_person_idx ON instructor_qualifications (person_id);

    CREATE TABLE instructor_courses (
      person_id uuid NOT NULL REFERENCES people(id),
      course_id uuid NOT NULL REFERENCES courses(id),
      PRIMARY KEY (person_id, course_id)
    );

    CREATE TABLE syllabus_revisions (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      course_id uuid NOT NULL REFERENCES courses(id),
      number integer NOT NULL CHECK (number > 0),
      approved_on date,
      effective_from date,
      change_note text NOT NULL DEFAULT '',
      created_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (course_id, number)
    );

    CREATE TABLE syllabus_stages (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      revision_id uuid NOT NULL REFERENCES syllabus_revisions(id),
      position integer NOT NULL,
      code text NOT NULL,
      title text NOT NULL,
      UNIQUE (revision_id, position),
      UNIQUE (revision_id, code)
    );

    CREATE TABLE syllabus_items (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      revision_id uuid NOT NULL REFERENCES syllabus_revisions(id),
      stage_id uuid NOT NULL REFERENCES syllabus_stages(id),
      position integer NOT NULL,
      code text NOT NULL,
      title text NOT NULL,
      objective text NOT NULL,
      completion_standard text NOT NULL,
      required_level text NOT NULL CHECK (required_level IN ('rote','understanding','application','correlation')),
      UNIQUE (stage_id, position),
      UNIQUE (revision_id, code)
    );

    CREATE TABLE cohorts (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      course_id uuid NOT NULL REFERENCES courses(id),
      name text NOT NULL,
      lead_instructor_id uuid NOT NULL REFERENCES people(id),
      starts_on date NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (school_id, name)
    );

    CREATE TABLE cohort_memberships (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      cohort_id uuid NOT NULL REFERENCES cohorts(id),
      student_id uuid NOT NULL REFERENCES people(id),
      from_date date NOT NULL,
      to_date date,
      CHECK (to_date IS NULL OR to_date >= from_date),
      -- a student belongs to at most one cohort on any date
      EXCLUDE USING gist (student_id WITH =, daterange(from_date, to_date, '[)') WITH &&)
    );

    CREATE TABLE enrolments (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      student_id uuid NOT NULL REFERENCES people(id),
      course_id uuid NOT NULL REFERENCES courses(id),
      revision_id uuid NOT NULL REFERENCES syllabus_revisions(id),
      enrolled_on date NOT NULL,
      status text NOT NULL CHECK (status IN ('active','completed','withdrawn','suspended')),
      ended_on date,
      end_reason text,
      CHECK ((status = 'active') = (ended_on IS NULL))
    );
    CREATE UNIQUE INDEX enrolments_one_active ON enrolments (student_id, course_id) WHERE status = 'active';

    CREATE TABLE sponsor_links (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      sponsor_id uuid NOT NULL REFERENCES people(id),
      student_id uuid NOT NULL REFERENCES people(id),
      relationship text NOT NULL DEFAULT 'sponsor',
      shares_attendance boolean NOT NULL DEFAULT true,
      shares_hours boolean NOT NULL DEFAULT true,
      shares_progress boolean NOT NULL DEFAULT true,
      shares_schedule boolean NOT NULL DEFAULT true,
      weekly_letter boolean NOT NULL DEFAULT true,
      created_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (sponsor_id, student_id),
      CHECK (sponsor_id <> student_id)
    );

    CREATE TABLE sign_in_throttle (
      email text NOT NULL,
      address text NOT NULL,
      failures integer NOT NULL DEFAULT 0,
      locked_until timestamptz,
      updated_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (email, address)
    );

    CREATE TABLE idempotency_keys (
      person_id uuid NOT NULL REFERENCES people(id),
      key text NOT NULL CHECK (length(key) BETWEEN 8 AND 100),
      scope text NOT NULL,
      result jsonb NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (person_id, key)
    );

    CREATE TABLE outbox (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      kind text NOT NULL,
      idempotency_key text NOT NULL UNIQUE,
      recipient_id uuid REFERENCES people(id),
      to_address text NOT NULL,
      subject text NOT NULL,
      body_text text NOT NULL,
      body_html text NOT NULL,
      headers jsonb NOT NULL DEFAULT '{}'::jsonb,
      due_at timestamptz NOT NULL,
      state text NOT NULL DEFAULT 'queued' CHECK (state IN ('queued','sent','failed','cancelled')),
      attempts integer NOT NULL DEFAULT 0,
      last_error text,
      message_id text NOT NULL,
      sent_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX outbox_due_idx ON outbox (due_at) WHERE state = 'queued';
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP TABLE IF EXISTS outbox, idempotency_keys, sign_in_throttle, sponsor_links, enrolments,
      cohort_memberships, cohorts, syllabus_items, syllabus_stages, syllabus_revisions,
      instructor_courses, instructor_qualifications, courses, people, schools CASCADE;
  `);
}
