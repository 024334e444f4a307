import "server-only";
import { listSessions, type SessionRow } from "../timetable/list-sessions";
import { stagesWaitingTop, type StageWaiting } from "../records/stages-waiting";
import { oralChecksDueTop, type OralCheckDue } from "./oral-checks-due";
import { getSchool } from "../shared/school";
import { can } from "@/lib/auth/can";
import { now } from "@/lib/clock";
import { dateInZone, zonedInstant } from "@/lib/time";
import type { CurrentUser } from "@/lib/auth/session";

// The instructor's Today: their own sessions today and this week, the checks due among the students
// they teach (stages ready for their stage check, items taught and not yet checked orally), and the sessions that have ended with no attendance recorded yet.

export interface TeachingWeek {
  /** the school's date today (YYYY-MM-DD) */
  today: string;
  timeZone: string;
  /** Monday and Sunday of this week, in the school's time zone */
  weekFrom: string;
  weekTo: string;
  todaySessions: SessionRow[];
  /** the week's other sessions, Monday to Sunday, today's left out */
  weekSessions: SessionRow[];
  /** the CHECKS_DUE_SHOWN stages ready for their check that have waited longest */
  checksDue: StageWaiting[];
  /** how many stages are ready for their check in all */
  checksDueTotal: number;
  /** items taught in an attended session with no satisfactory oral check yet, per student (the first ORAL_CHECKS_LISTED by name) */
  oralChecksDue: OralCheckDue[];
  /** how many students have such items in all */
  oralChecksDueTotal: number;
}

function addDays(date: string, days: number): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

/** How many stages ready for their check the Today page names; the rest are counted (a caller who keeps the whole school's records may have thousands). */
export const CHECKS_DUE_SHOWN = 10;
/** How many students with items ready for an oral check the Today page lists (5 shown, the rest folded); the others are counted. */
export const ORAL_CHECKS_LISTED = 40;

export async function teachingWeek(user: CurrentUser): Promise<TeachingWeek> {
  const { timeZone } = await getSchool(user.schoolId);
  const today = dateInZone(now(), timeZone);
  const weekday = (new Date(`${today}T00:00:00Z`).getUTCDay() + 6) % 7; // Monday 0 … Sunday 6
  const monday = addDays(today, -weekday);
  const { rows } = await listSessions(
    user,
    {
      instructor: user.id,
      status: "scheduled",
      fromInstant: zonedInstant(monday, "00:00", timeZone),
      toInstant: zonedInstant(addDays(monday, 7), "00:00", timeZone),
    },
    { sort: "starts_at", dir: "asc", pageSize: 200 },
  );
  const [checksDue, oralDue] = can(user, "today.teaching")
    ? await Promise.all([stagesWaitingTop(user, CHECKS_DUE_SHOWN), oralChecksDueTop(user, ORAL_CHECKS_LISTED)])
    : [
        { total: 0, top: [] },
        { students: [], total: 0 },
      ];
  return {
    today,
    timeZone,
    weekFrom: monday,
    weekTo: addDays(monday, 6),
    todaySessions: rows.filter((r) => r.date === today),
    weekSessions: rows.filter((r) => r.date !== today),
    checksDue: checksDue.top,
    checksDueTotal: checksDue.total,
    oralChecksDue: oralDue.students,
    oralChecksDueTotal: oralDue.total,
  };
}

/** Sessions the instructor taught that have ended (by the clock) with nobody's attendance recorded: asked for as soon as they end. */
export async function sessionsAwaitingAttendance(user: CurrentUser): Promise<SessionRow[]> {
  const at = now();
  const { rows } = await listSessions(
    user,
    { status: "scheduled", toInstant: at, instructor: user.id },
    { sort: "starts_at", dir: "desc", pageSize: 50 },
  );
  return rows.filter((r) => new Date(r.endsAt).getTime() <= at.getTime() && r.recordedCount === 0 && r.attendeeCount > 0);
}
