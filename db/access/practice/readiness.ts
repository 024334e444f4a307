import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { requireStudentFor } from "../shared/student-scope";

// Practice readiness for the instructor: per syllabus item, the student's practice attempts and
// the share correct in the last 30 days. Practice only: it never counts as an oral check.

export interface PracticeReadinessRow {
  itemId: string | null;
  itemCode: string | null;
  itemTitle: string | null;
  attempts: number;
  correct: number;
  percent: number;
}

export async function practiceReadinessFor(caller: CurrentUser, studentId: string): Promise<PracticeReadinessRow[]> {
  if (!can(caller, "practice.view")) throw new HttpError(403, "practice: not allowed");
  await requireStudentFor(caller, studentId, "records");
  const rows = await sequelize.query<Omit<PracticeReadinessRow, "percent">>(
    `SELECT p.syllabus_item_id AS "itemId", i.code AS "itemCode", i.title AS "itemTitle",
            count(*)::int AS attempts, count(*) FILTER (WHERE p.correct)::int AS correct
       FROM practice_attempts p LEFT JOIN syllabus_items i ON i.id = p.syllabus_item_id
      WHERE p.school_id = :schoolId AND p.student_id = :studentId AND p.answered_at > CAST(:now AS timestamptz) - interval '30 days'
      GROUP BY p.syllabus_item_id, i.code, i.title
      ORDER BY i.code NULLS LAST`,
    { replacements: { schoolId: caller.schoolId, studentId, now: now() }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ ...r, percent: r.attempts === 0 ? 0 : Math.round((r.correct * 100) / r.attempts) }));
}
