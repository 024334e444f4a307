import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import { formatDayTime, formatInZone } from "@/lib/time";

// The database refuses double-booking (exclusion constraints); this turns a refusal into a 409 that names what is busy.

/** The Postgres error behind a Sequelize error, if any. */
function pgError(e: unknown): { code?: string; constraint?: string } | null {
  const err = e as { parent?: { code?: string; constraint?: string }; original?: { code?: string; constraint?: string } };
  return err?.parent ?? err?.original ?? null;
}

export interface Range {
  startsAt: Date;
  endsAt: Date;
}

/**
 * Turns an exclusion-constraint refusal into a 409 that says who or what is busy, and when.
 * Runs after the failed statement's savepoint was rolled back, so the transaction is usable.
 */
async function conflictError(
  t: Transaction,
  constraint: string | undefined,
  s: { schoolId: string; sessionId: string | null; instructorId: string; room: { id: string; name: string }; studentIds: string[] } & Range,
  timeZone: string,
): Promise<HttpError> {
  const when = (r: { startsAt: Date; endsAt: Date; title: string }) =>
    `"${r.title}" ${formatDayTime(new Date(r.startsAt), timeZone)}–${formatInZone(new Date(r.endsAt), timeZone, "HH:mm")}`;
  const base = `SELECT s.starts_at AS "startsAt", s.ends_at AS "endsAt", br.title FROM training_sessions s
                  JOIN briefing_revisions br ON br.id = s.briefing_revision_id
                 WHERE s.status = 'scheduled' AND tstzrange(s.starts_at, s.ends_at, '[)') && tstzrange(:a, :b, '[)')
                   AND (:self::uuid IS NULL OR s.id <> :self::uuid)`;
  const rep = { a: s.startsAt, b: s.endsAt, self: s.sessionId, i: s.instructorId, room: s.room.id };
  if (constraint === "training_sessions_instructor_busy") {
    const [hit] = await sequelize.query<{ startsAt: Date; endsAt: Date; title: string }>(`${base} AND s.instructor_id = :i LIMIT 1`, {
      replacements: rep,
      type: QueryTypes.SELECT,
      transaction: t,
    });
    const [p] = await sequelize.query<{ name: string }>(`SELECT name FROM people WHERE id = :i`, {
      replacements: rep,
      type: QueryTypes.SELECT,
      transaction: t,
    });
    return new HttpError(
      409,
      `instructorId: ${p?.name ?? "the instructor"} already teaches ${hit ? when(hit) : "at that time"}`,
      "instructorId",
    );
  }
  if (constraint === "training_sessions_room_busy") {
    const [hit] = await sequelize.query<{ startsAt: Date; endsAt: Date; title: string }>(`${base} AND s.room_id = :room LIMIT 1`, {
      replacements: rep,
      type: QueryTypes.SELECT,
      transaction: t,
    });
    return new HttpError(409, `room: ${s.room.name} is already booked for ${hit ? when(hit) : "that time"}`, "room");
  }
  if (constraint === "session_attendees_student_busy") {
    const [hit] = await sequelize.query<{ startsAt: Date; endsAt: Date; title: string; name: string }>(
      `SELECT s.starts_at AS "startsAt", s.ends_at AS "endsAt", br.title, p.name FROM session_attendees a
         JOIN training_sessions s ON s.id = a.session_id JOIN briefing_revisions br ON br.id = s.briefing_revision_id
         JOIN people p ON p.id = a.student_id
        WHERE a.status = 'scheduled' AND a.student_id = ANY(ARRAY[:students]::uuid[])
          AND tstzrange(a.starts_at, a.ends_at, '[)') && tstzrange(:a, :b, '[)') AND (:self::uuid IS NULL OR a.session_id <> :self::uuid)
        ORDER BY p.name LIMIT 1`,
      {
        replacements: { ...rep, students: s.studentIds.length ? s.studentIds : ["00000000-0000-0000-0000-000000000000"] },
        type: QueryTypes.SELECT,
        transaction: t,
      },
    );
    return new HttpError(
      409,
      `students: ${hit ? `${hit.name} is already in ${when(hit)}` : "a student is already in another session then"}`,
      "studentIds",
    );
  }
  return new HttpError(409, "The session overlaps another one", "date");
}

/** Runs `fn` in a savepoint; an exclusion refusal comes back as a 409 naming what is busy. */
export async function guardOverlap<T>(
  t: Transaction,
  ctx: {
    schoolId: string;
    sessionId: string | null;
    instructorId: string;
    room: { id: string; name: string };
    studentIds: string[];
  } & Range,
  timeZone: string,
  fn: (sp: Transaction) => Promise<T>,
): Promise<T> {
  try {
    return await sequelize.transaction({ transaction: t }, fn);
  } catch (e) {
    const pe = pgError(e);
    if (pe?.code === "23P01") throw await conflictError(t, pe.constraint, ctx, timeZone);
    throw e;
  }
}
