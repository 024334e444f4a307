import type { MigrationContext } from "../migrate";

// Transfers in and retention of records.
// - transfer_credits: ground time and syllabus items credited from an earlier school, with the
//   evidence file and the knowledge/proficiency test this school gave (append-only, each in the
//   audit chain); transfer_credit_items lists the items credited.
// - retention_settings: which retention rules apply to the school (counted from the end of training).
// - retention_holds: a legal hold the chief sets and lifts with a reason (lifting is the one update).
// - record_archivals: the chief's "archived" mark on a student's record past its retention date
//   (append-only; nothing is ever deleted).
export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(`
    CREATE TABLE transfer_credits (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      student_id uuid NOT NULL REFERENCES people(id),
      course_id uuid NOT NULL REFERENCES courses(id),
      enrolment_id uuid NOT NULL REFERENCES enrolments(id),
      source_school text NOT NULL CHECK (length(source_school) BETWEEN 1 AND 200),
      source_approved boolean NOT NULL,
      credited_minutes integer NOT NULL CHECK (credited_minutes >= 0),
      cap_minutes integer NOT NULL CHECK (cap_minutes >= 0),
      test_kind text NOT NULL CHECK (test_kind IN ('knowledge','proficiency','both')),
      test_taken_on date NOT NULL,
      test_result text NOT NULL CHECK (length(test_result) BETWEEN 1 AND 200),
      note text NOT NULL DEFAULT '' CHECK (length(note) <= 2000),
      evidence_file_name text NOT NULL CHECK (length(evidence_file_name) BETWEEN 1 AND 255),
      evidence_content_type text NOT NULL CHECK (evidence_content_type IN ('application/pdf','image/png','image/jpeg')),
      evidence_byte_size integer NOT NULL CHECK (evidence_byte_size > 0),
      evidence_sha256 text NOT NULL,
      evidence bytea NOT NULL,
      recorded_by uuid NOT NULL REFERENCES people(id),
      idempotency_key text,
      audit_hash text NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX transfer_credits_student ON transfer_credits (student_id, course_id);
    CREATE INDEX transfer_credits_school ON transfer_credits (school_id, created_at);
    CREATE UNIQUE INDEX transfer_credits_idempotency ON transfer_credits (recorded_by, idempotency_key) WHERE idempotency_key IS NOT NULL;

    CREATE TABLE transfer_credit_items (
      credit_id uuid NOT NULL REFERENCES transfer_credits(id),
      syllabus_item_id uuid NOT NULL REFERENCES syllabus_items(id),
      PRIMARY KEY (credit_id, syllabus_item_id)
    );

    CREATE TABLE retention_settings (
      school_id uuid PRIMARY KEY REFERENCES schools(id),
      school_records boolean NOT NULL,
      instructor_records boolean NOT NULL,
      easa_ato boolean NOT NULL,
      updated_by uuid REFERENCES people(id),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE retention_holds (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      student_id uuid NOT NULL REFERENCES people(id),
      reason text NOT NULL CHECK (length(reason) BETWEEN 3 AND 2000),
      set_by uuid NOT NULL REFERENCES people(id),
      set_at timestamptz NOT NULL DEFAULT now(),
      lifted_by uuid REFERENCES people(id),
      lifted_reason text CHECK (lifted_reason IS NULL OR length(lifted_reason) BETWEEN 3 AND 2000),
      lifted_at timestamptz,
      CHECK ((lifted_at IS NULL) = (lifted_by IS NULL) AND (lifted_at IS NULL) = (lifted_reason IS NULL))
    );
    CREATE UNIQUE INDEX retention_holds_one_open ON retention_holds (student_id) WHERE lifted_at IS NULL;

    CREATE TABLE record_archivals (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      student_id uuid NOT NULL REFERENCES people(id) UNIQUE,
      ended_on date NOT NULL,
      keep_until date NOT NULL,
      archived_by uuid NOT NULL REFERENCES people(id),
      audit_hash text NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      CHECK (keep_until > ended_on)
    );
  `);
  for (const table of ["transfer_credits", "transfer_credit_items", "record_archivals"]) {
    await context.sequelize.query(`
      CREATE TRIGGER ${table}_no_update BEFORE UPDATE OR DELETE ON ${table} FOR EACH ROW EXECUTE FUNCTION records_refuse_change();
      CREATE TRIGGER ${table}_no_truncate BEFORE TRUNCATE ON ${table} FOR EACH STATEMENT EXECUTE FUNCTION records_refuse_change();
      REVOKE UPDATE, DELETE, TRUNCATE ON ${table} FROM ${app};
      GRANT SELECT, INSERT ON ${table} TO ${app};
    `);
  }
  await context.sequelize.query(`
    REVOKE DELETE, TRUNCATE ON retention_settings, retention_holds FROM ${app};
    GRANT SELECT, INSERT, UPDATE ON retention_settings, retention_holds TO ${app};
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP TABLE IF EXISTS record_archivals, retention_holds, retention_settings, transfer_credit_items, transfer_credits;
  `);
}
