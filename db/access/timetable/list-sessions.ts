import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { getSchool } from "../shared/school";
import { studentScopeSql } from "../shared/student-scope";
import { formatInZone, dateInZone } from "@/lib/time";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import type { SessionsQuery } from "@/lib/timetable/schema";

export interface SessionRow {
  id: string;
  briefingId: string;
  briefingTitle: string;
  revisionNumber: number;
  startsAt: string;
  endsAt: string;
  /** wall-clock date and times in the school's time zone */
  date: string;
  startLocal: string;
  endLocal: string;
  durationMinutes: number;
  room: string;
  instructorId: string;
  instructorName: string;
  cohortId: string | null;
  cohortName: string | null;
  status: "scheduled" | "cancelled";
  sequence: number;
  cancelReason: string | null;
  attendeeCount: number;
  recordedCount: number;
}

export type SessionFilter = Partial<Pick<SessionsQuery, "instructor" | "cohort" | "room" | "mine">> & {
  status?: SessionsQuery["status"];
  fromInstant?: Date;
  toInstant?: Date;
  /** only sessions this student attends (a staff caller looking at one student) */
  attendee?: string;
};

const SORT_SQL: Record<SessionsQuery["sort"], string> = {
  starts_at: "s.starts_at",
  briefing: "br.title",
  room: "lower(s.room)",
  instructor: "ip.name",
  cohort: "c.name",
};

/**
 * Sessions the caller may see: without `timetable.view`, none; staff (`timetable.schedule`), the
 * school's (with `mine` for their own); anyone else, those attended by students in their "schedule" scope
 * (a student: the sessions they attend).
 */
export async function listSessions(
  user: CurrentUser,
  filter: SessionFilter,
  paging: { sort?: SessionsQuery["sort"]; dir?: "asc" | "desc"; page?: number; pageSize?: number } = {},
  /** the school's time zone when the caller has read it already (a route handler: React `cache` keeps nothing there) */
  known?: { timeZone: string },
): Promise<{ rows: SessionRow[]; total: number }> {
  if (!can(user, "timetable.view")) return { rows: [], total: 0 };
  const staff = can(user, "timetable.schedule");
  const tz = known?.timeZone ?? (await getSchool(user.schoolId)).timeZone;
  const where = [`s.school_id = :school`];
  const rep: Record<string, unknown> = { school: user.schoolId, uid: user.id };
  if (!staff) {
    // everyone else: sessions attended by a student they may see for the "schedule" purpose
    const f = studentScopeSql(user, "schedule", "a.student_id");
    where.push(`EXISTS (SELECT 1 FROM session_attendees a WHERE a.session_id = s.id AND ${f.sql})`);
    Object.assign(rep, f.replacements);
  }
  if (filter.mine === "1")
    where.push(`(s.instructor_id = :uid OR EXISTS (SELECT 1 FROM session_attendees a WHERE a.session_id = s.id AND a.student_id = :uid))`);
  if (filter.attendee) {
    where.push(`EXISTS (SELECT 1 FROM session_attendees a WHERE a.session_id = s.id AND a.student_id = :attendee)`);
    rep.attendee = filter.attendee;
  }
  if (filter.instructor) {
    where.push(`s.instructor_id = :instructor`);
    rep.instructor = filter.instructor;
  }
  if (filter.cohort) {
    where.push(`s.cohort_id = :cohort`);
    rep.cohort = filter.cohort;
  }
  if (filter.room) {
    where.push(`lower(btrim(s.room)) = lower(btrim(:room))`);
    rep.room = filter.room;
  }
  if (filter.status && filter.status !== "all") {
    where.push(`s.status = :status`);
    rep.status = filter.status;
  }
  if (filter.fromInstant) {
    where.push(`s.ends_at > :from`);
    rep.from = filter.fromInstant;
  }
  if (filter.toInstant) {
    where.push(`s.starts_at < :to`);
    rep.to = filter.toInstant;
  }
  const pageSize = paging.pageSize ?? 500;
  const page = paging.page ?? 1;
  const order = `${SORT_SQL[paging.sort ?? "starts_at"]} ${paging.dir === "desc" ? "DESC" : "ASC"}, s.starts_at ASC, s.id`;
  const from = `FROM training_sessions s JOIN briefing_revisions br ON br.id = s.briefing_revision_id
                JOIN people ip ON ip.id = s.instructor_id LEFT JOIN cohorts c ON c.id = s.cohort_id
               WHERE ${where.join(" AND ")}`;
  const [count] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${from}`, { replacements: rep, type: QueryTypes.SELECT });
  const raw = await sequelize.query<
    Omit<SessionRow, "date" | "startLocal" | "endLocal" | "startsAt" | "endsAt"> & { startsAt: Date; endsAt: Date }
  >(
    `SELECT s.id, s.briefing_id AS "briefingId", br.title AS "briefingTitle", br.number AS "revisionNumber",
            s.starts_at AS "startsAt", s.ends_at AS "endsAt", (extract(epoch FROM s.ends_at - s.starts_at) / 60)::int AS "durationMinutes",
            s.room, s.instructor_id AS "instructorId", ip.name AS "instructorName", s.cohort_id AS "cohortId", c.name AS "cohortName",
            s.status, s.sequence, s.cancel_reason AS "cancelReason",
            (SELECT count(*)::int FROM session_attendees a WHERE a.session_id = s.id) AS "attendeeCount",
            (SELECT count(DISTINCT g.student_id)::int FROM ground_log_entries g WHERE g.session_id = s.id) AS "recordedCount"
       ${from} ORDER BY ${order} LIMIT :limit OFFSET :offset`,
    { replacements: { ...rep, limit: pageSize, offset: (page - 1) * pageSize }, type: QueryTypes.SELECT },
  );
  const rows = raw.map((r) => {
    const a = new Date(r.startsAt);
    const e = new Date(r.endsAt);
    return {
      ...r,
      startsAt: a.toISOString(),
      endsAt: e.toISOString(),
      date: dateInZone(a, tz),
      startLocal: formatInZone(a, tz, "HH:mm"),
      endLocal: formatInZone(e, tz, "HH:mm"),
    };
  });
  return { rows, total: count?.n ?? 0 };
}
