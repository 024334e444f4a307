import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { formatDay } from "@/lib/time";
import {
  choicesFrom,
  PICKER_LIST_MAX,
  PICKER_RESULTS,
  type EndorsementPickerKind,
  type PickerAnswer,
  type PickerChoices,
  type PickerOption,
} from "@/lib/directory/picker";
import { studentScopeSql } from "../shared/student-scope";
import { studentChoices } from "../directory/students";
import { containsPattern } from "../shared/like";

// The endorsement log (kept at least 3 years, 14 CFR 61.189; rows are never deleted): instructors
// see their own endorsements, the chief every endorsement of the school; both within the
// records scope. Also the students one may endorse and the open remedial items.

export interface EndorsementLogRow {
  id: string;
  studentId: string;
  studentName: string;
  courseCode: string;
  instructorName: string;
  authorityName: string;
  endorsedOn: string;
  attempt: number;
  takenOn: string | null;
  scorePercent: number | null;
  passed: boolean | null;
  validUntil: string | null;
  areasMissed: string[];
}

export const ENDORSEMENT_LOG_PAGE_SIZE = 50;

export interface EndorsementLogPage {
  rows: EndorsementLogRow[];
  /** how many endorsements match */
  total: number;
  page: number;
  pageSize: number;
}

/** The endorsements the caller may read (their own, or the school's for the chief) within the records scope. */
function logWhere(user: CurrentUser, alias: string) {
  const scope = studentScopeSql(user, "records", `${alias}.student_id`);
  const own = can(user, "endorsements.all") ? "TRUE" : `${alias}.instructor_id = :uid`;
  return {
    sql: `${alias}.school_id = :school AND ${own} AND ${scope.sql}`,
    replacements: { school: user.schoolId, uid: user.id, ...scope.replacements },
  };
}

/**
 * One page of the endorsement log, newest first, optionally narrowed to students whose name
 * contains `name`; the number that match from one count. Two queries whatever the log's length
 * (the log is never pruned, so it grows with the years).
 */
export async function endorsementLogPage(
  user: CurrentUser,
  filter: { name?: string | undefined } = {},
  opts: { page?: number; pageSize?: number } = {},
): Promise<EndorsementLogPage> {
  const where = logWhere(user, "e");
  const pageSize = opts.pageSize ?? ENDORSEMENT_LOG_PAGE_SIZE;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const replacements = { ...where.replacements, name: filter.name ? containsPattern(filter.name) : null };
  const named = "(CAST(:name AS text) IS NULL OR s.name ILIKE CAST(:name AS text))";
  const [rows, [count]] = await Promise.all([
    sequelize.query<EndorsementLogRow>(
      `SELECT e.id, e.student_id AS "studentId", s.name AS "studentName", c.code AS "courseCode", i.name AS "instructorName",
              e.authority_name AS "authorityName", e.endorsed_on AS "endorsedOn", e.attempt,
              r.taken_on AS "takenOn", r.score_percent AS "scorePercent", r.passed, r.valid_until AS "validUntil",
              COALESCE(r.areas_missed, '{}') AS "areasMissed"
         FROM knowledge_test_endorsements e
         JOIN people s ON s.id = e.student_id JOIN people i ON i.id = e.instructor_id JOIN courses c ON c.id = e.course_id
         LEFT JOIN knowledge_test_results r ON r.endorsement_id = e.id
        WHERE ${where.sql} AND ${named}
        ORDER BY e.endorsed_on DESC, e.created_at DESC, e.id DESC LIMIT :limit OFFSET :offset`,
      { replacements: { ...replacements, limit: pageSize, offset: (page - 1) * pageSize }, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM knowledge_test_endorsements e JOIN people s ON s.id = e.student_id WHERE ${where.sql} AND ${named}`,
      { replacements, type: QueryTypes.SELECT },
    ),
  ]);
  return { rows, total: count?.n ?? 0, page, pageSize };
}

/**
 * The result forms' choices, from one LIMITed query: the endorsements still awaiting their test
 * result (newest first; an endorsement leaves this list once its result is in) and the open
 * remedial items of the students in the caller's records scope (by student, then area). `q`: a
 * part of the student's name (or of the remedial item's area).
 */
async function readEndorsementChoices(user: CurrentUser, kind: EndorsementPickerKind, q: string, limit: number): Promise<PickerOption[]> {
  if (!can(user, "endorsements.results")) throw new HttpError(403, "You do not have access to this");
  const pattern = q ? containsPattern(q) : null;
  if (kind === "awaiting") {
    const where = logWhere(user, "e");
    const rows = await sequelize.query<{ id: string; studentName: string; endorsedOn: string }>(
      `SELECT e.id, s.name AS "studentName", e.endorsed_on AS "endorsedOn"
         FROM knowledge_test_endorsements e JOIN people s ON s.id = e.student_id
        WHERE ${where.sql} AND NOT EXISTS (SELECT 1 FROM knowledge_test_results r WHERE r.endorsement_id = e.id)
          ${pattern ? "AND s.name ILIKE :pattern" : ""}
        ORDER BY e.endorsed_on DESC, e.created_at DESC, e.id DESC LIMIT :limit`,
      { replacements: { ...where.replacements, pattern, limit }, type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({ id: r.id, name: r.studentName, detail: formatDay(r.endorsedOn) }));
  }
  const scope = studentScopeSql(user, "records", "m.student_id");
  const rows = await sequelize.query<{ id: string; studentName: string; area: string; takenOn: string }>(
    `SELECT m.id, p.name AS "studentName", m.area, r.taken_on AS "takenOn"
       FROM knowledge_test_remedials m JOIN people p ON p.id = m.student_id JOIN knowledge_test_results r ON r.id = m.result_id
      WHERE m.school_id = :school AND m.state = 'open' AND ${scope.sql}
        ${pattern ? "AND (p.name ILIKE :pattern OR m.area ILIKE :pattern)" : ""}
      ORDER BY p.name, m.area, m.id LIMIT :limit`,
    { replacements: { school: user.schoolId, ...scope.replacements, pattern, limit }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ id: r.id, name: `${r.studentName}: ${r.area}`, detail: `test of ${formatDay(r.takenOn)}` }));
}

/** A result form's choices: all of them up to PICKER_LIST_MAX, else "search" (GET /api/directory/endorsements). */
export async function endorsementChoices(user: CurrentUser, kind: EndorsementPickerKind): Promise<PickerChoices> {
  if (!can(user, "endorsements.results")) return { kind: "list", rows: [] };
  return choicesFrom(await readEndorsementChoices(user, kind, "", PICKER_LIST_MAX + 1));
}

/** Up to PICKER_RESULTS of a result form's choices matching `q`, and whether more match. */
export async function searchEndorsementChoices(user: CurrentUser, kind: EndorsementPickerKind, q: string): Promise<PickerAnswer> {
  const rows = await readEndorsementChoices(user, kind, q, PICKER_RESULTS + 1);
  return { rows: rows.slice(0, PICKER_RESULTS).map((r) => ({ ...r, primary: r.name })), more: rows.length > PICKER_RESULTS };
}

/**
 * Students on a course whom the caller may endorse (records scope), by name: all of them up to
 * PICKER_LIST_MAX, else "search" (the form's search picker, purpose `endorsements`).
 */
export async function endorsableStudents(user: CurrentUser): Promise<PickerChoices> {
  if (!can(user, "endorsements.sign")) return { kind: "list", rows: [] };
  return studentChoices(user, "endorsements");
}
