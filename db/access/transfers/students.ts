import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { activeEnrolmentLateral } from "../shared/enrolment";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { transferCapMinutes } from "@/lib/transfers/cap";
import { PICKER_LIST_MAX } from "@/lib/directory/picker";
import { itemsOfRevision, type ItemRef } from "../records/items";

// The choices of the transfer credit form: the school's students in training, each with their
// course's minimum, the minutes already credited by transfer, and the syllabus items to credit.
// Up to PICKER_LIST_MAX students they are all listed; above it the form searches for a student
// (GET /api/directory/students?purpose=transfers) and the page reads the chosen one alone.

export interface TransferStudentChoice {
  id: string;
  name: string;
  courseCode: string;
  minGroundMinutes: number;
  approvedCapMinutes: number;
  notApprovedCapMinutes: number;
  creditedApproved: number;
  creditedNotApproved: number;
  revisionId: string;
}

export interface TransferChoices {
  /** "list": every student in training is in `students`; "search": only the chosen one (if any) */
  kind: "list" | "search";
  students: TransferStudentChoice[];
  items: Record<string, ItemRef[]>;
}

export async function transferChoices(user: CurrentUser, opts: { studentId?: string } = {}): Promise<TransferChoices> {
  if (!can(user, "transfers.manage")) throw new HttpError(403, "Only the chief instructor records transfer credit");
  let rows = await readStudents(user, null, PICKER_LIST_MAX + 1);
  const kind = rows.length > PICKER_LIST_MAX ? "search" : "list";
  if (kind === "search") rows = opts.studentId && UUID.test(opts.studentId) ? await readStudents(user, opts.studentId, 1) : [];
  const items: Record<string, ItemRef[]> = {};
  for (const revisionId of new Set(rows.map((r) => r.revisionId))) items[revisionId] = await itemsOfRevision(revisionId);
  return {
    kind,
    students: rows.map((r) => ({
      ...r,
      approvedCapMinutes: transferCapMinutes(r.minGroundMinutes, true),
      notApprovedCapMinutes: transferCapMinutes(r.minGroundMinutes, false),
    })),
    items,
  };
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Students in training, by name: all up to `limit`, or the one with this id. */
async function readStudents(user: CurrentUser, studentId: string | null, limit: number) {
  return sequelize.query<Omit<TransferStudentChoice, "approvedCapMinutes" | "notApprovedCapMinutes">>(
    `SELECT p.id, p.name, co.code AS "courseCode", co.min_ground_minutes AS "minGroundMinutes", e.revision_id AS "revisionId",
            COALESCE((SELECT sum(credited_minutes) FROM transfer_credits c WHERE c.student_id = p.id AND c.course_id = e.course_id AND c.source_approved), 0)::int AS "creditedApproved",
            COALESCE((SELECT sum(credited_minutes) FROM transfer_credits c WHERE c.student_id = p.id AND c.course_id = e.course_id AND NOT c.source_approved), 0)::int AS "creditedNotApproved"
       FROM people p JOIN ${activeEnrolmentLateral("p.id")} e ON true JOIN courses co ON co.id = e.course_id
      WHERE p.school_id = :school AND 'student' = ANY(p.roles) AND p.active AND (CAST(:id AS uuid) IS NULL OR p.id = CAST(:id AS uuid))
      ORDER BY p.name, p.id LIMIT :limit`,
    { replacements: { school: user.schoolId, id: studentId, limit }, type: QueryTypes.SELECT },
  );
}
