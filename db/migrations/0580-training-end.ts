import type { MigrationContext } from "../migrate";

// End of training: how an enrolment ended (graduated, terminated, transferred out) beside its
// date and reason, and the chief instructor's certifications of a student's record (append-only,
// each also written to the audit chain). A graduation is certified at most once per enrolment.
export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(`
    ALTER TABLE enrolments ADD COLUMN end_kind text CHECK (end_kind IN ('graduated','terminated','transferred'));
    ALTER TABLE enrolments ADD CONSTRAINT enrolments_end_kind_ended CHECK (end_kind IS NULL OR status <> 'active');

    CREATE TABLE record_certifications (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      student_id uuid NOT NULL REFERENCES people(id),
      enrolment_id uuid NOT NULL REFERENCES enrolments(id),
      purpose text NOT NULL CHECK (purpose IN ('graduation','termination','transfer_out')),
      certifier_id uuid NOT NULL REFERENCES people(id),
      certifier_certificate text,
      statement text NOT NULL CHECK (length(statement) BETWEEN 20 AND 4000),
      certified_on date NOT NULL,
      audit_hash text NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX record_certifications_once ON record_certifications (enrolment_id, purpose);
    CREATE INDEX record_certifications_student ON record_certifications (school_id, student_id);
    CREATE TRIGGER record_certifications_no_update BEFORE UPDATE OR DELETE ON record_certifications
      FOR EACH ROW EXECUTE FUNCTION records_refuse_change();
    CREATE TRIGGER record_certifications_no_truncate BEFORE TRUNCATE ON record_certifications
      FOR EACH STATEMENT EXECUTE FUNCTION records_refuse_change();
    REVOKE UPDATE, DELETE, TRUNCATE ON record_certifications FROM ${app};
    GRANT SELECT, INSERT ON record_certifications TO ${app};
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP TABLE IF EXISTS record_certifications;
    ALTER TABLE enrolments DROP CONSTRAINT IF EXISTS enrolments_end_kind_ended;
    ALTER TABLE enrolments DROP COLUMN IF EXISTS end_kind;
  `);
}
