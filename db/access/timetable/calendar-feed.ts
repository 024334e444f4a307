import "server-only";
import { createHash, randomBytes } from "node:crypto";
import ical, { ICalEventStatus } from "ical-generator";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { getSchool } from "../shared/school";
import { now } from "@/lib/clock";
import type { CurrentUser } from "@/lib/auth/session";

// The personal iCalendar feed: a secret token per person (only its hash kept) and the feed text.

const FEED_TOKEN = /^[A-Za-z0-9_-]{43}$/;
const feedHash = (token: string) => createHash("sha256").update(token).digest("hex");

/** Makes (or replaces) the caller's secret feed token; the old one stops working at once. Only its hash is kept. */
export async function resetCalendarToken(user: CurrentUser, t: Transaction): Promise<{ token: string; path: string }> {
  const token = randomBytes(32).toString("base64url");
  await sequelize.query(
    `INSERT INTO calendar_feeds (person_id, token_hash, created_at) VALUES (:p, :h, :now)
     ON CONFLICT (person_id) DO UPDATE SET token_hash = EXCLUDED.token_hash, created_at = EXCLUDED.created_at`,
    { replacements: { p: user.id, h: feedHash(token), now: now() }, transaction: t },
  );
  return { token, path: `/api/calendar/${token}.ics` };
}

export async function calendarFeedCreatedAt(personId: string): Promise<Date | null> {
  const [r] = await sequelize.query<{ createdAt: Date }>(`SELECT created_at AS "createdAt" FROM calendar_feeds WHERE person_id = :p`, {
    replacements: { p: personId },
    type: QueryTypes.SELECT,
  });
  return r ? new Date(r.createdAt) : null;
}

/**
 * The iCalendar text of a feed token, or null for an unknown (or replaced) token. Holds the
 * sessions the person teaches or attends, from 60 days back, cancelled ones included with
 * STATUS:CANCELLED; each event's UID is the session's id and its SEQUENCE the session's sequence.
 */
export async function calendarFeed(token: string): Promise<string | null> {
  if (!FEED_TOKEN.test(token)) return null;
  const [person] = await sequelize.query<{ id: string; name: string; schoolId: string; active: boolean }>(
    `SELECT p.id, p.name, p.school_id AS "schoolId", p.active FROM calendar_feeds f JOIN people p ON p.id = f.person_id WHERE f.token_hash = :h`,
    { replacements: { h: feedHash(token) }, type: QueryTypes.SELECT },
  );
  if (!person || !person.active) return null;
  const school = await getSchool(person.schoolId);
  const since = new Date(now().getTime() - 60 * 24 * 3600_000);
  const rows = await sequelize.query<{
    id: string;
    title: string;
    objective: string;
    startsAt: Date;
    endsAt: Date;
    room: string;
    instructorName: string;
    status: string;
    sequence: number;
    cancelReason: string | null;
    updatedAt: Date;
  }>(
    `SELECT s.id, br.title, br.objective, s.starts_at AS "startsAt", s.ends_at AS "endsAt", s.room, ip.name AS "instructorName",
            s.status, s.sequence, s.cancel_reason AS "cancelReason", s.updated_at AS "updatedAt"
       FROM training_sessions s JOIN briefing_revisions br ON br.id = s.briefing_revision_id JOIN people ip ON ip.id = s.instructor_id
      WHERE s.school_id = :school AND s.ends_at > :since
        AND (s.instructor_id = :p OR EXISTS (SELECT 1 FROM session_attendees a WHERE a.session_id = s.id AND a.student_id = :p))
      ORDER BY s.starts_at`,
    { replacements: { school: person.schoolId, since, p: person.id }, type: QueryTypes.SELECT },
  );
  const cal = ical({ name: `${school.name}: Timetable`, prodId: { company: "Chalkwing", product: "Timetable", language: "EN" } });
  for (const r of rows) {
    cal.createEvent({
      id: `${r.id}@sessions.chalkwing.test`,
      start: new Date(r.startsAt),
      end: new Date(r.endsAt),
      stamp: new Date(r.updatedAt),
      summary: r.status === "cancelled" ? `Cancelled: ${r.title}` : r.title,
      location: r.room,
      description: [`Instructor: ${r.instructorName}`, r.objective, r.cancelReason ? `Cancelled: ${r.cancelReason}` : ""]
        .filter(Boolean)
        .join("\n\n"),
      sequence: r.sequence,
      status: r.status === "cancelled" ? ICalEventStatus.CANCELLED : ICalEventStatus.CONFIRMED,
    });
  }
  return cal.toString();
}
