import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { retentionFor, RETENTION_RULES, type RetentionRule, type RetentionState } from "@/lib/retention/rules";
import { getSchool } from "../shared/school";
import { retentionSettingsFor, rulesOf } from "./settings";

// Retention of each student's record (cross-area contract): counted from the end of training (the
// latest ended enrolment of a student with none active), the longest rule that applies, a legal
// hold, and the chief's archived mark. Read here once; the archive list and the inspection pack use it.

export interface RetentionRow {
  studentId: string;
  name: string;
  email: string;
  endedOn: string | null;
  endKind: string | null;
  keepUntil: string | null;
  governing: RetentionRule[];
  state: RetentionState;
  hold: { id: string; reason: string; setAt: Date; setByName: string } | null;
  archived: { on: Date; byName: string } | null;
}

interface Raw {
  studentId: string;
  name: string;
  email: string;
  endedOn: string | null;
  endKind: string | null;
  holdId: string | null;
  holdReason: string | null;
  holdSetAt: Date | null;
  holdSetBy: string | null;
  archivedAt: Date | null;
  archivedBy: string | null;
}

async function rawRows(schoolId: string, studentId: string | null, t?: Transaction): Promise<Raw[]> {
  return sequelize.query<Raw>(
    `SELECT p.id AS "studentId", p.name, p.email,
            CASE WHEN EXISTS (SELECT 1 FROM enrolments a WHERE a.student_id = p.id AND a.status = 'active') THEN NULL
                 ELSE (SELECT to_char(max(e.ended_on), 'YYYY-MM-DD') FROM enrolments e WHERE e.student_id = p.id) END AS "endedOn",
            (SELECT e.end_kind FROM enrolments e WHERE e.student_id = p.id AND e.status <> 'active' ORDER BY e.ended_on DESC LIMIT 1) AS "endKind",
            h.id AS "holdId", h.reason AS "holdReason", h.set_at AS "holdSetAt", hp.name AS "holdSetBy",
            ar.created_at AS "archivedAt", ap.name AS "archivedBy"
       FROM people p
       LEFT JOIN retention_holds h ON h.student_id = p.id AND h.lifted_at IS NULL
       LEFT JOIN people hp ON hp.id = h.set_by
       LEFT JOIN record_archivals ar ON ar.student_id = p.id
       LEFT JOIN people ap ON ap.id = ar.archived_by
      WHERE p.school_id = :school AND 'student' = ANY(p.roles)
        AND EXISTS (SELECT 1 FROM enrolments e WHERE e.student_id = p.id)
        ${studentId ? "AND p.id = :student" : ""}
      ORDER BY p.name`,
    { replacements: { school: schoolId, student: studentId }, type: QueryTypes.SELECT, transaction: t },
  );
}

function decide(r: Raw, rules: RetentionRule[], today: string): RetentionRow {
  const d = retentionFor({ endedOn: r.endedOn, rules, onHold: !!r.holdId, archived: !!r.archivedAt, today });
  return {
    studentId: r.studentId,
    name: r.name,
    email: r.email,
    endedOn: r.endedOn,
    endKind: r.endKind,
    keepUntil: d.keepUntil,
    governing: d.governing,
    state: d.state,
    hold: r.holdId ? { id: r.holdId, reason: r.holdReason!, setAt: r.holdSetAt!, setByName: r.holdSetBy! } : null,
    archived: r.archivedAt ? { on: r.archivedAt, byName: r.archivedBy! } : null,
  };
}

/** The retention of one student's record (no permission check: the caller was given the student). */
export async function retentionOf(schoolId: string, studentId: string, t?: Transaction): Promise<RetentionRow | null> {
  const school = await getSchool(schoolId, t);
  const rules = rulesOf(await retentionSettingsFor(schoolId, t));
  const [r] = await rawRows(schoolId, studentId, t);
  return r ? decide(r, rules, dateInZone(now(), school.timeZone)) : null;
}

/** The states a record whose training has ended can be in, in the order the archive list shows them. */
export const LISTED_STATES = ["due", "held", "kept", "archived"] as const;
export type ListedState = (typeof LISTED_STATES)[number];
/** How many records each section of the archive list names before "see all"; a section alone shows this many a page. */
export const RETENTION_SECTION_FIRST = 20;
export const RETENTION_PAGE_SIZE = 50;

export interface RetentionOverview {
  today: string;
  rules: RetentionRule[];
  /** how many records are in each state */
  counts: Record<ListedState, number>;
  /** the records shown, by state: the first RETENTION_SECTION_FIRST of each, or one page of the state asked for */
  sections: Record<ListedState, RetentionRow[]>;
  /** the state asked for (one section, paged), if any */
  state: ListedState | null;
  page: number;
  pageSize: number;
}

/**
 * The records whose training has ended (the latest enrolment ended, none active), each with its
 * state decided in SQL exactly as `retentionFor` decides it (archived, else on hold, else past the
 * retention date or not; the date is the same calendar day the longest rule's years later, 29
 * February moving to 1 March), so the list is counted, sorted and paged in the database.
 */
function endedRecordsSql(years: number | null) {
  const keepUntil =
    years === null
      ? "NULL::date"
      : "(make_date(extract(year FROM x.ended_on)::int + :years, extract(month FROM x.ended_on)::int, 1) + (extract(day FROM x.ended_on)::int - 1))";
  return `WITH x AS (
       SELECT e.student_id, max(e.ended_on) AS ended_on,
              (array_agg(e.end_kind ORDER BY e.ended_on DESC NULLS LAST) FILTER (WHERE e.status <> 'active'))[1] AS end_kind
         FROM enrolments e JOIN people p ON p.id = e.student_id
        WHERE p.school_id = :school AND 'student' = ANY(p.roles)
        GROUP BY e.student_id HAVING NOT bool_or(e.status = 'active')),
     r AS (
       SELECT p.id AS "studentId", p.name, p.email, to_char(x.ended_on, 'YYYY-MM-DD') AS "endedOn", x.end_kind AS "endKind",
              h.id AS "holdId", h.reason AS "holdReason", h.set_at AS "holdSetAt", hp.name AS "holdSetBy",
              ar.created_at AS "archivedAt", ap.name AS "archivedBy",
              CASE WHEN ar.id IS NOT NULL THEN 'archived' WHEN h.id IS NOT NULL THEN 'held'
                   WHEN ${years === null ? "TRUE" : `CAST(:today AS date) <= ${keepUntil}`} THEN 'kept' ELSE 'due' END AS state
         FROM x JOIN people p ON p.id = x.student_id
         LEFT JOIN retention_holds h ON h.student_id = p.id AND h.lifted_at IS NULL
         LEFT JOIN people hp ON hp.id = h.set_by
         LEFT JOIN record_archivals ar ON ar.student_id = p.id
         LEFT JOIN people ap ON ap.id = ar.archived_by
        WHERE x.ended_on IS NOT NULL)`;
}

/**
 * The chief's archive list: how many records are in each state, and the first
 * RETENTION_SECTION_FIRST of each by name, or (with `state`) one page of that state. Two queries
 * however many students have left.
 */
export async function retentionOverview(user: CurrentUser, opts: { state?: ListedState; page?: number } = {}): Promise<RetentionOverview> {
  if (!can(user, "retention.manage")) throw new HttpError(403, "Only the chief instructor sees the retention of records");
  const school = await getSchool(user.schoolId);
  const rules = rulesOf(await retentionSettingsFor(user.schoolId));
  const today = dateInZone(now(), school.timeZone);
  const years = rules.length ? Math.max(...rules.map((r) => RETENTION_RULES[r].years)) : null;
  const base = endedRecordsSql(years);
  const state = opts.state ?? null;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const pageSize = state ? RETENTION_PAGE_SIZE : RETENTION_SECTION_FIRST;
  const replacements = { school: user.schoolId, years, today, state, limit: pageSize, offset: (page - 1) * pageSize };
  const [counted, raw] = await Promise.all([
    sequelize.query<{ state: ListedState; n: number }>(`${base} SELECT state, count(*)::int AS n FROM r GROUP BY state`, {
      replacements,
      type: QueryTypes.SELECT,
    }),
    sequelize.query<Raw & { state: ListedState }>(
      state
        ? `${base} SELECT * FROM r WHERE state = :state ORDER BY name, "studentId" LIMIT :limit OFFSET :offset`
        : `${base} SELECT * FROM (SELECT r.*, row_number() OVER (PARTITION BY state ORDER BY name, "studentId") AS rn FROM r) f
            WHERE rn <= :limit ORDER BY name, "studentId"`,
      { replacements, type: QueryTypes.SELECT },
    ),
  ]);
  const counts = Object.fromEntries(LISTED_STATES.map((k) => [k, 0])) as Record<ListedState, number>;
  for (const c of counted) counts[c.state] = c.n;
  const sections = Object.fromEntries(LISTED_STATES.map((k) => [k, [] as RetentionRow[]])) as Record<ListedState, RetentionRow[]>;
  for (const r of raw) sections[r.state].push(decide(r, rules, today));
  return { today, rules, counts, sections, state, page, pageSize };
}
