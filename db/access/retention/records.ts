import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { retentionFor, type RetentionRule, type RetentionState } from "@/lib/retention/rules";
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

/** Every student record whose training has ended, with its retention (the chief's archive list). */
export async function retentionList(user: CurrentUser): Promise<{ today: string; rules: RetentionRule[]; rows: RetentionRow[] }> {
  if (!can(user, "retention.manage")) throw new HttpError(403, "Only the chief instructor sees the retention of records");
  const school = await getSchool(user.schoolId);
  const rules = rulesOf(await retentionSettingsFor(user.schoolId));
  const today = dateInZone(now(), school.timeZone);
  const rows = (await rawRows(user.schoolId, null)).filter((r) => r.endedOn !== null).map((r) => decide(r, rules, today));
  return { today, rules, rows };
}
