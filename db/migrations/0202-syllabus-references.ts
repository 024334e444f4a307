import type { MigrationContext } from "../migrate";

// A syllabus revision is frozen while anything refers to it. 0200 checked enrolments and
// briefing revisions; this adds the records and make-up items of other areas, looked up at run
// time because their migrations (0250, 0300) run after this one on a fresh database.
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    CREATE OR REPLACE FUNCTION syllabus_revision_referenced(rev uuid) RETURNS text LANGUAGE plpgsql STABLE AS $fn$
    DECLARE
      found boolean;
      t record;
    BEGIN
      IF EXISTS (SELECT 1 FROM enrolments WHERE revision_id = rev) THEN RETURN 'enrolments'; END IF;
      IF EXISTS (SELECT 1 FROM briefing_revisions WHERE syllabus_revision_id = rev) THEN RETURN 'briefing revisions'; END IF;
      FOR t IN SELECT * FROM (VALUES ('sign_offs', 'sign-offs'), ('oral_check_items', 'oral checks'),
                                     ('oral_check_questions', 'oral check questions'), ('makeup_items', 'make-up items')) v(tbl, label)
      LOOP
        IF to_regclass('public.' || t.tbl) IS NOT NULL THEN
          EXECUTE format('SELECT EXISTS (SELECT 1 FROM %I x JOIN syllabus_items i ON i.id = x.syllabus_item_id WHERE i.revision_id = $1)', t.tbl)
            INTO found USING rev;
          IF found THEN RETURN t.label; END IF;
        END IF;
      END LOOP;
      RETURN NULL;
    END $fn$;
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    CREATE OR REPLACE FUNCTION syllabus_revision_referenced(rev uuid) RETURNS text LANGUAGE sql STABLE AS $fn$
      SELECT CASE
        WHEN EXISTS (SELECT 1 FROM enrolments WHERE revision_id = rev) THEN 'enrolments'
        WHEN EXISTS (SELECT 1 FROM briefing_revisions WHERE syllabus_revision_id = rev) THEN 'briefing revisions'
        ELSE NULL END
    $fn$;
  `);
}
