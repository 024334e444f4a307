import type { MigrationContext } from "../migrate";

// Knowledge-test endorsements: the school's authority settings (wording, pass mark, validity of a
// result, attempt limit), the endorsements an instructor signs (append-only, each in the audit
// chain), the results of the tests taken on them (append-only; passed derived from the pass mark in
// force) and the remedial items a result's missed knowledge areas open (a small table of their own:
// makeup_items needs a syllabus item, while a missed area is the authority's wording).
export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(`
    CREATE TABLE authority_settings (
      school_id uuid PRIMARY KEY REFERENCES schools(id),
      authority_name text NOT NULL CHECK (length(authority_name) BETWEEN 1 AND 100),
      endorsement_wording text NOT NULL CHECK (length(endorsement_wording) BETWEEN 20 AND 4000),
      pass_mark_percent integer NOT NULL CHECK (pass_mark_percent BETWEEN 1 AND 100),
      result_validity_months integer NOT NULL CHECK (result_validity_months BETWEEN 1 AND 120),
      attempt_limit integer NOT NULL CHECK (attempt_limit BETWEEN 1 AND 20),
      updated_by uuid REFERENCES people(id),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE knowledge_test_endorsements (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      student_id uuid NOT NULL REFERENCES people(id),
      course_id uuid NOT NULL REFERENCES courses(id),
      enrolment_id uuid NOT NULL REFERENCES enrolments(id),
      instructor_id uuid NOT NULL REFERENCES people(id),
      endorsed_on date NOT NULL,
      authority_name text NOT NULL,
      wording text NOT NULL,
      statement text NOT NULL CHECK (length(statement) BETWEEN 20 AND 8000),
      attempt integer NOT NULL CHECK (attempt > 0),
      audit_hash text NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    -- one endorsement per attempt: two concurrent endorsements of one student cannot both pass
    CREATE UNIQUE INDEX knowledge_test_endorsements_attempt ON knowledge_test_endorsements (student_id, course_id, attempt);
    CREATE INDEX knowledge_test_endorsements_instructor ON knowledge_test_endorsements (school_id, instructor_id, endorsed_on);

    CREATE TABLE knowledge_test_results (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      endorsement_id uuid NOT NULL UNIQUE REFERENCES knowledge_test_endorsements(id),
      student_id uuid NOT NULL REFERENCES people(id),
      course_id uuid NOT NULL REFERENCES courses(id),
      taken_on date NOT NULL,
      score_percent integer NOT NULL CHECK (score_percent BETWEEN 0 AND 100),
      pass_mark_percent integer NOT NULL CHECK (pass_mark_percent BETWEEN 1 AND 100),
      passed boolean NOT NULL,
      valid_until date,
      areas_missed text[] NOT NULL DEFAULT '{}',
      recorded_by uuid NOT NULL REFERENCES people(id),
      audit_hash text NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      CHECK (passed = (score_percent >= pass_mark_percent)),
      CHECK (passed = (valid_until IS NOT NULL))
    );
    CREATE INDEX knowledge_test_results_course ON knowledge_test_results (school_id, course_id, taken_on);
    CREATE INDEX knowledge_test_results_student ON knowledge_test_results (student_id, course_id, taken_on);

    CREATE TABLE knowledge_test_remedials (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      student_id uuid NOT NULL REFERENCES people(id),
      result_id uuid NOT NULL REFERENCES knowledge_test_results(id),
      area text NOT NULL CHECK (length(area) BETWEEN 1 AND 200),
      state text NOT NULL DEFAULT 'open' CHECK (state IN ('open','done')),
      closed_by uuid REFERENCES people(id),
      closed_at timestamptz,
      note text NOT NULL DEFAULT '' CHECK (length(note) <= 2000),
      created_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (result_id, area),
      CHECK ((state = 'done') = (closed_at IS NOT NULL AND closed_by IS NOT NULL))
    );
    CREATE INDEX knowledge_test_remedials_student ON knowledge_test_remedials (student_id, state);
  `);
  for (const table of ["knowledge_test_endorsements", "knowledge_test_results"]) {
    await context.sequelize.query(`
      CREATE TRIGGER ${table}_no_update BEFORE UPDATE OR DELETE ON ${table} FOR EACH ROW EXECUTE FUNCTION records_refuse_change();
      CREATE TRIGGER ${table}_no_truncate BEFORE TRUNCATE ON ${table} FOR EACH STATEMENT EXECUTE FUNCTION records_refuse_change();
      REVOKE UPDATE, DELETE, TRUNCATE ON ${table} FROM ${app};
      GRANT SELECT, INSERT ON ${table} TO ${app};
    `);
  }
  await context.sequelize.query(`
    REVOKE DELETE, TRUNCATE ON knowledge_test_remedials, authority_settings FROM ${app};
    GRANT SELECT, INSERT, UPDATE ON knowledge_test_remedials, authority_settings TO ${app};
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP TABLE IF EXISTS knowledge_test_remedials, knowledge_test_results, knowledge_test_endorsements, authority_settings;
  `);
}
