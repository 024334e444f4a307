import "server-only";
import type { Transaction } from "sequelize";
import { sequelize } from "../../index";
import { now } from "@/lib/clock";

/** An absence opens one make-up item per syllabus item the session covered, unless one is already outstanding for that item. */
export async function openMakeupForAbsence(
  t: Transaction,
  p: { schoolId: string; studentId: string; sessionId: string; itemIds: string[] },
): Promise<number> {
  if (p.itemIds.length === 0) return 0;
  const [rows] = await sequelize.query(
    `INSERT INTO makeup_items (school_id, student_id, syllabus_item_id, source_kind, source_id)
     SELECT :school, :student, x, 'absence', :session FROM unnest(ARRAY[:items]::uuid[]) AS x
      -- one outstanding item per syllabus item: a second absence on it adds nothing new to make up
      WHERE NOT EXISTS (SELECT 1 FROM makeup_items o WHERE o.student_id = :student AND o.syllabus_item_id = x AND o.state IN ('open','scheduled') AND o.source_id <> :session)
     ON CONFLICT (student_id, syllabus_item_id, source_kind, source_id) DO UPDATE
       SET state = 'open', closed_by_kind = NULL, closed_by_id = NULL, closed_at = NULL
       WHERE makeup_items.closed_by_kind = 'attendance_amended'
     RETURNING id`,
    { replacements: { school: p.schoolId, student: p.studentId, session: p.sessionId, items: p.itemIds }, transaction: t },
  );
  return (rows as unknown[]).length;
}

/** Attending a session closes the student's make-up items for the items it covers, and those planned into it. */
export async function closeMakeupByAttendance(
  t: Transaction,
  p: { studentId: string; sessionId: string; itemIds: string[] },
): Promise<void> {
  await sequelize.query(
    `UPDATE makeup_items SET state = 'done', closed_by_kind = 'session', closed_by_id = :session, closed_at = :now, scheduled_session_id = NULL
      WHERE student_id = :student AND state IN ('open','scheduled') AND source_id <> :session
        AND (syllabus_item_id = ANY(ARRAY[:items]::uuid[]) OR scheduled_session_id = :session)`,
    {
      replacements: {
        session: p.sessionId,
        now: now(),
        student: p.studentId,
        items: p.itemIds.length ? p.itemIds : ["00000000-0000-0000-0000-000000000000"],
      },
      transaction: t,
    },
  );
}
