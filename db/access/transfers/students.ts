import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { transferCapMinutes } from "@/lib/transfers/cap";
import { itemsOfRevision, type ItemRef } from "../records/items";

// The choices of the transfer credit form: the school's students in training, each with their
// course's minimum, the minutes already credited by transfer, and the syllabus items to credit.

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

export async function transferChoices(user: CurrentUser): Promise<{ students: TransferStudentChoice[]; items: Record<string, ItemRef[]> }> {
  if (!can(user, "transfers.manage")) throw new HttpError(403, "Only the chief instructor records transfer credit");
  const rows = await sequelize.query<Omit<TransferStudentChoice, "approvedCapMinutes" | "notApprovedCapMinutes">>(
    `SELECT p.id, p.name, co.code AS "courseCode", co.min_ground_minutes AS "minGroundMinutes", e.revision_id AS "revisionId",
            COALESCE((SELECT sum(credited_minutes) FROM transfer_credits c WHERE c.student_id = p.id AND c.course_id = e.course_id AND c.source_approved), 0)::int AS "creditedApproved",
            COALESCE((SELECT sum(credited_minutes) FROM transfer_credits c WHERE c.student_id = p.id AND c.course_id = e.course_id AND NOT c.source_approved), 0)::int AS "creditedNotApproved"
       FROM people p JOIN active_enrolments e ON e.student_id = p.id JOIN courses co ON co.id = e.course_id
      WHERE p.school_id = :school AND 'student' = ANY(p.roles) AND p.active
      ORDER BY p.name`,
    { replacements: { school: user.schoolId }, type: QueryTypes.SELECT },
  );
  const items: Record<string, ItemRef[]> = {};
  for (const revisionId of new Set(rows.map((r) => r.revisionId))) items[revisionId] = await itemsOfRevision(revisionId);
  return {
    students: rows.map((r) => ({
      ...r,
      approvedCapMinutes: transferCapMinutes(r.minGroundMinutes, true),
      notApprovedCapMinutes: transferCapMinutes(r.minGroundMinutes, false),
    })),
    items,
  };
}
