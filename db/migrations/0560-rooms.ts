import type { MigrationContext } from "../migrate";

// Rooms: a managed list per school (name, capacity, active). A room's name is unique per school
// once normalised (case, outer spaces and runs of inner white space do not count), so
// "hangar  classroom " and "Hangar classroom" are one room. Every distinct normalised room text
// already on the Timetable becomes a room; sessions point at their room through room_id, and the
// room double-booking constraint of 0250 works on room_id instead of the text.
//
// training_sessions.room stays as a readable copy of the room's name for old readers: a trigger
// fills it from room_id (and, for writers that still give only the text, finds or makes the room
// by its normalised name), and a rename of the room rewrites the copies.
const KEY = (col: string) => `lower(btrim(regexp_replace(${col}, '\\s+', ' ', 'g')))`;
const TIDY = (col: string) => `btrim(regexp_replace(${col}, '\\s+', ' ', 'g'))`;

export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    CREATE TABLE rooms (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      school_id uuid NOT NULL REFERENCES schools(id),
      name text NOT NULL CHECK (length(btrim(name)) BETWEEN 1 AND 100),
      name_key text GENERATED ALWAYS AS (${KEY("name")}) STORED,
      capacity integer CHECK (capacity IS NULL OR capacity BETWEEN 1 AND 1000),
      active boolean NOT NULL DEFAULT true,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CONSTRAINT rooms_school_name_unique UNIQUE (school_id, name_key)
    );

    INSERT INTO rooms (school_id, name)
    SELECT DISTINCT ON (school_id, ${KEY("room")}) school_id, ${TIDY("room")}
      FROM training_sessions
     ORDER BY school_id, ${KEY("room")}, created_at, id;

    ALTER TABLE training_sessions ADD COLUMN room_id uuid REFERENCES rooms(id);
    UPDATE training_sessions s SET room_id = r.id FROM rooms r WHERE r.school_id = s.school_id AND r.name_key = ${KEY("s.room")};
    ALTER TABLE training_sessions ALTER COLUMN room_id SET NOT NULL;
    CREATE INDEX training_sessions_room_idx ON training_sessions (room_id, starts_at);

    -- room_id is the truth; room is the room's name, copied. A writer that gives only the text
    -- (or changes only the text) gets the room of that normalised name, made if it is new.
    CREATE FUNCTION training_session_room() RETURNS trigger LANGUAGE plpgsql AS $fn$
    BEGIN
      IF TG_OP = 'UPDATE' AND NEW.room_id IS NOT DISTINCT FROM OLD.room_id AND NEW.room IS DISTINCT FROM OLD.room THEN
        NEW.room_id := NULL;
      END IF;
      IF NEW.room_id IS NULL THEN
        IF NEW.room IS NULL OR length(${TIDY("NEW.room")}) = 0 THEN
          RAISE EXCEPTION 'a session needs a room' USING ERRCODE = '23502';
        END IF;
        INSERT INTO rooms (school_id, name) VALUES (NEW.school_id, ${TIDY("NEW.room")})
          ON CONFLICT (school_id, name_key) DO NOTHING;
        SELECT id INTO NEW.room_id FROM rooms WHERE school_id = NEW.school_id AND name_key = ${KEY("NEW.room")};
      END IF;
      SELECT name INTO NEW.room FROM rooms WHERE id = NEW.room_id AND school_id = NEW.school_id;
      IF NOT FOUND THEN
        RAISE EXCEPTION 'room % is not a room of this school', NEW.room_id USING ERRCODE = '23503';
      END IF;
      RETURN NEW;
    END $fn$;
    CREATE TRIGGER training_sessions_room BEFORE INSERT OR UPDATE OF room, room_id, school_id ON training_sessions
      FOR EACH ROW EXECUTE FUNCTION training_session_room();

    CREATE FUNCTION room_renamed() RETURNS trigger LANGUAGE plpgsql AS $fn$
    BEGIN
      UPDATE training_sessions SET room = NEW.name WHERE room_id = NEW.id AND room IS DISTINCT FROM NEW.name;
      RETURN NULL;
    END $fn$;
    CREATE TRIGGER rooms_renamed AFTER UPDATE OF name ON rooms
      FOR EACH ROW WHEN (NEW.name IS DISTINCT FROM OLD.name) EXECUTE FUNCTION room_renamed();

    ALTER TABLE training_sessions DROP CONSTRAINT training_sessions_room_busy;
    ALTER TABLE training_sessions ADD CONSTRAINT training_sessions_room_busy
      EXCLUDE USING gist (room_id WITH =, tstzrange(starts_at, ends_at, '[)') WITH &&) WHERE (status = 'scheduled');
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    ALTER TABLE training_sessions DROP CONSTRAINT IF EXISTS training_sessions_room_busy;
    DROP TRIGGER IF EXISTS training_sessions_room ON training_sessions;
    DROP FUNCTION IF EXISTS training_session_room();
    DROP TRIGGER IF EXISTS rooms_renamed ON rooms;
    DROP FUNCTION IF EXISTS room_renamed();
    ALTER TABLE training_sessions DROP COLUMN IF EXISTS room_id;
    DROP TABLE IF EXISTS rooms;
    ALTER TABLE training_sessions ADD CONSTRAINT training_sessions_room_busy
      EXCLUDE USING gist (school_id WITH =, (lower(btrim(room))) WITH =, tstzrange(starts_at, ends_at, '[)') WITH &&) WHERE (status = 'scheduled');
  `);
}
