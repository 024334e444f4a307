import type { MigrationContext } from "../migrate";

// Curve Lab: aircraft profiles (airframes), demos with numbered revisions (the same parent +
// numbered-revision pattern as syllabus revisions) and the students' Call it first attempts.
// A demo revision snapshots the airframe's numbers in its spec, so a later profile edit never
// changes what was taught. Calls are append-only.
export async function up({ context }: { context: MigrationContext }) {
  const app = `"${context.appRole}"`;
  await context.sequelize.query(`
    CREATE TABLE airframes (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
      empty_mass_kg double precision NOT NULL CHECK (empty_mass_kg > 0),
      max_mass_kg double precision NOT NULL CHECK (max_mass_kg >= empty_mass_kg),
      wing_area_m2 double precision NOT NULL CHECK (wing_area_m2 > 0),
      wing_span_m double precision NOT NULL CHECK (wing_span_m > 0),
      oswald_efficiency double precision NOT NULL CHECK (oswald_efficiency > 0 AND oswald_efficiency <= 1),
      zero_lift_drag_coefficient double precision NOT NULL CHECK (zero_lift_drag_coefficient > 0),
      -- {"clean": {"cd0Increment": 0, "maxLiftCoefficient": 1.4}, "gearDown": {...} | null, "flaps1": ..., "flaps2": ...}
      configurations jsonb NOT NULL,
      notes text NOT NULL DEFAULT '' CHECK (length(notes) <= 4000),
      created_by uuid NOT NULL REFERENCES people(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      retired_at timestamptz
    );
    CREATE INDEX airframes_school_idx ON airframes (school_id);

    CREATE TABLE demos (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
      owner_id uuid NOT NULL REFERENCES people(id),
      current_revision_id uuid,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      deleted_at timestamptz
    );
    CREATE INDEX demos_school_idx ON demos (school_id) WHERE deleted_at IS NULL;

    CREATE TABLE demo_revisions (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      demo_id uuid NOT NULL REFERENCES demos(id),
      number integer NOT NULL CHECK (number > 0),
      spec jsonb NOT NULL,
      created_by uuid NOT NULL REFERENCES people(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (demo_id, number)
    );
    ALTER TABLE demos ADD CONSTRAINT demos_current_revision_fk
      FOREIGN KEY (current_revision_id) REFERENCES demo_revisions(id) DEFERRABLE INITIALLY DEFERRED;

    CREATE TABLE demo_calls (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      demo_revision_id uuid NOT NULL REFERENCES demo_revisions(id),
      student_id uuid NOT NULL REFERENCES people(id),
      marker_kind text NOT NULL CHECK (marker_kind IN ('vmd','stall','gust')),
      -- speeds on the revision's speed axis (EAS or TAS), m/s
      speed_axis text NOT NULL CHECK (speed_axis IN ('equivalent','true')),
      predicted_ms double precision NOT NULL CHECK (predicted_ms > 0),
      actual_ms double precision NOT NULL CHECK (actual_ms > 0),
      error_ms double precision NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX demo_calls_revision_idx ON demo_calls (demo_revision_id);
    CREATE INDEX demo_calls_student_idx ON demo_calls (student_id);
    REVOKE UPDATE, DELETE, TRUNCATE ON demo_calls FROM ${app};
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    DROP TABLE IF EXISTS demo_calls;
    ALTER TABLE IF EXISTS demos DROP CONSTRAINT IF EXISTS demos_current_revision_fk;
    DROP TABLE IF EXISTS demo_revisions;
    DROP TABLE IF EXISTS demos;
    DROP TABLE IF EXISTS airframes;
  `);
}
