import type { MigrationContext } from "../migrate";

// Instructor files with history (instructor records are kept at least 3 years, 14 CFR 61.189;
// here nothing is ever deleted).
// - `instructor_qualifications` holds versions: each qualification (`qualification_id`) has
//   numbered versions, each in force over [valid_from, valid_to) in the school's calendar. A change
//   closes the open version (the only UPDATE allowed: setting its valid_to once) and appends the next.
// - `instructor_courses` holds dated grants of the courses an instructor may teach, closed the same way.
// - `instructor_qualifications_current` / `instructor_courses_current`: the open versions.
// An act (sign-off, oral check, stage check) is judged against the version in force on its date.
export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(`
    ALTER TABLE instructor_qualifications
      ADD COLUMN qualification_id uuid,
      ADD COLUMN version integer NOT NULL DEFAULT 1 CHECK (version > 0),
      ADD COLUMN valid_from date,
      ADD COLUMN valid_to date,
      ADD COLUMN recorded_by uuid REFERENCES people(id),
      ADD COLUMN change_note text NOT NULL DEFAULT '' CHECK (length(change_note) <= 500);
    UPDATE instructor_qualifications SET qualification_id = id, valid_from = issued_on;
    ALTER TABLE instructor_qualifications
      ALTER COLUMN qualification_id SET NOT NULL,
      ALTER COLUMN valid_from SET NOT NULL,
      ADD CONSTRAINT instructor_qualifications_valid_range CHECK (valid_to IS NULL OR valid_to >= valid_from),
      ADD CONSTRAINT instructor_qualifications_version_unique UNIQUE (qualification_id, version);
    CREATE UNIQUE INDEX instructor_qualifications_one_open ON instructor_qualifications (qualification_id) WHERE valid_to IS NULL;

    ALTER TABLE instructor_courses DROP CONSTRAINT instructor_courses_pkey;
    ALTER TABLE instructor_courses
      ADD COLUMN id uuid NOT NULL DEFAULT gen_random_uuid() PRIMARY KEY,
      ADD COLUMN valid_from date NOT NULL DEFAULT '-infinity',
      ADD COLUMN valid_to date,
      ADD COLUMN recorded_by uuid REFERENCES people(id),
      ADD COLUMN recorded_at timestamptz NOT NULL DEFAULT now(),
      ADD CONSTRAINT instructor_courses_valid_range CHECK (valid_to IS NULL OR valid_to >= valid_from);
    CREATE UNIQUE INDEX instructor_courses_one_open ON instructor_courses (person_id, course_id) WHERE valid_to IS NULL;

    -- a first version is in force from the day the certificate was issued unless told otherwise
    CREATE FUNCTION instructor_qualifications_first() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      NEW.qualification_id := COALESCE(NEW.qualification_id, NEW.id);
      NEW.valid_from := COALESCE(NEW.valid_from, NEW.issued_on);
      RETURN NEW;
    END $$;
    CREATE TRIGGER instructor_qualifications_first BEFORE INSERT ON instructor_qualifications
      FOR EACH ROW EXECUTE FUNCTION instructor_qualifications_first();

    -- the only change allowed: closing an open version (valid_to set once, nothing else)
    CREATE FUNCTION instructor_history_close_only() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'UPDATE' AND OLD.valid_to IS NULL AND NEW.valid_to IS NOT NULL
         AND (to_jsonb(NEW) - 'valid_to') = (to_jsonb(OLD) - 'valid_to') THEN
        RETURN NEW;
      END IF;
      RAISE EXCEPTION 'instructor records are kept: % on % is refused (close the version and add a new one)', TG_OP, TG_TABLE_NAME
        USING ERRCODE = 'insufficient_privilege';
    END $$;
    CREATE TRIGGER instructor_qualifications_keep BEFORE UPDATE OR DELETE ON instructor_qualifications
      FOR EACH ROW EXECUTE FUNCTION instructor_history_close_only();
    CREATE TRIGGER instructor_qualifications_no_truncate BEFORE TRUNCATE ON instructor_qualifications
      FOR EACH STATEMENT EXECUTE FUNCTION instructor_history_close_only();
    CREATE TRIGGER instructor_courses_keep BEFORE UPDATE OR DELETE ON instructor_courses
      FOR EACH ROW EXECUTE FUNCTION instructor_history_close_only();
    CREATE TRIGGER instructor_courses_no_truncate BEFORE TRUNCATE ON instructor_courses
      FOR EACH STATEMENT EXECUTE FUNCTION instructor_history_close_only();

    REVOKE UPDATE, DELETE, TRUNCATE ON instructor_qualifications, instructor_courses FROM ${app};
    GRANT UPDATE (valid_to) ON instructor_qualifications, instructor_courses TO ${app};

    CREATE VIEW instructor_qualifications_current AS
      SELECT * FROM instructor_qualifications WHERE valid_to IS NULL;
    CREATE VIEW instructor_courses_current AS
      SELECT * FROM instructor_courses WHERE valid_to IS NULL;
    GRANT SELECT ON instructor_qualifications_current, instructor_courses_current TO ${app};
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP VIEW IF EXISTS instructor_qualifications_current, instructor_courses_current;
    DROP TRIGGER IF EXISTS instructor_qualifications_keep ON instructor_qualifications;
    DROP TRIGGER IF EXISTS instructor_qualifications_no_truncate ON instructor_qualifications;
    DROP TRIGGER IF EXISTS instructor_qualifications_first ON instructor_qualifications;
    DROP TRIGGER IF EXISTS instructor_courses_keep ON instructor_courses;
    DROP TRIGGER IF EXISTS instructor_courses_no_truncate ON instructor_courses;
    DROP FUNCTION IF EXISTS instructor_history_close_only(), instructor_qualifications_first();
    DELETE FROM instructor_qualifications WHERE valid_to IS NOT NULL;
    DELETE FROM instructor_courses WHERE valid_to IS NOT NULL;
    ALTER TABLE instructor_qualifications DROP COLUMN qualification_id, DROP COLUMN version, DROP COLUMN valid_from,
      DROP COLUMN valid_to, DROP COLUMN recorded_by, DROP COLUMN change_note;
    ALTER TABLE instructor_courses DROP COLUMN id, DROP COLUMN valid_from, DROP COLUMN valid_to, DROP COLUMN recorded_by, DROP COLUMN recorded_at;
    ALTER TABLE instructor_courses ADD PRIMARY KEY (person_id, course_id);
  `);
}
