import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { now } from "@/lib/clock";

/**
 * Making the Call it first on a demo completes the student's own assignments of that demo, in the
 * caller's transaction (the one that stores the call). Briefing assignments stay open: a briefing
 * asks more than one call. Returns how many assignments this completed.
 */
export async function completeDemoAssignmentsOnCall(
  schoolId: string,
  studentId: string,
  demoRevisionId: string,
  t: Transaction,
): Promise<number> {
  const done = await sequelize.query<{ assignment_id: string }>(
    `INSERT INTO assignment_completions (assignment_id, student_id, completed_at)
     SELECT s.assignment_id, s.student_id, :at FROM assignment_students s JOIN demo_revisions dr ON dr.demo_id = s.demo_id
      WHERE s.school_id = :schoolId AND s.student_id = :studentId AND s.kind = 'demo' AND dr.id = :demoRevisionId AND s.completed_at IS NULL
     ON CONFLICT (assignment_id, student_id) DO NOTHING
     RETURNING assignment_id`,
    { replacements: { schoolId, studentId, demoRevisionId, at: now() }, type: QueryTypes.SELECT, transaction: t },
  );
  return done.length;
}
