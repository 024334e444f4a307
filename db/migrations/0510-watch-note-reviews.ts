import type { MigrationContext } from "../migrate";

// The chief's reviews of watch notes. A watch note is derived (lib/records/watch-notes.ts), so a
// review names the note by its record, kind and item. Reviews are appended, never changed or
// deleted: the app role may only SELECT and INSERT, and triggers refuse UPDATE, DELETE and TRUNCATE.
// Stage checks are signed like sign-offs from now on: the statement the examiner signed is kept.
export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(`
    CREATE TABLE watch_note_reviews (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      record_type text NOT NULL CHECK (record_type IN ('sign_off','oral_check','stage_check')),
      record_id uuid NOT NULL,
      kind text NOT NULL CHECK (length(kind) BETWEEN 1 AND 40),
      item_code text NOT NULL DEFAULT '',
      remark text NOT NULL CHECK (length(remark) BETWEEN 3 AND 2000),
      reviewed_by uuid NOT NULL REFERENCES people(id),
      reviewed_at timestamptz NOT NULL
    );
    CREATE INDEX watch_note_reviews_note_idx ON watch_note_reviews (school_id, record_type, record_id, kind, item_code, reviewed_at);
    CREATE TRIGGER watch_note_reviews_no_update BEFORE UPDATE OR DELETE ON watch_note_reviews FOR EACH ROW EXECUTE FUNCTION records_refuse_change();
    CREATE TRIGGER watch_note_reviews_no_truncate BEFORE TRUNCATE ON watch_note_reviews FOR EACH STATEMENT EXECUTE FUNCTION records_refuse_change();
    REVOKE UPDATE, DELETE, TRUNCATE ON watch_note_reviews FROM ${app};
    GRANT SELECT, INSERT ON watch_note_reviews TO ${app};

    ALTER TABLE stage_checks ADD COLUMN statement text;
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP TABLE IF EXISTS watch_note_reviews;
    ALTER TABLE stage_checks DROP COLUMN IF EXISTS statement;
  `);
}
