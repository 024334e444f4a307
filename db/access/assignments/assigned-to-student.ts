import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";

// What reaches a student through assignments: the demos (directly, or through an assigned
// briefing's current revision) and the briefings assigned to them.

export interface AssignedDemo {
  assignmentId: string;
  demoId: string;
  demoRevisionId: string;
  name: string;
  dueOn: string;
  viaBriefingTitle: string | null;
}

/**
 * The demos assigned to a student: demos assigned directly (their current revision) and the
 * demos used by the current revision of briefings assigned to them. Deleted demos are left out.
 */
export async function listAssignedDemosForStudent(schoolId: string, studentId: string): Promise<AssignedDemo[]> {
  return sequelize.query<AssignedDemo>(
    `SELECT s.assignment_id AS "assignmentId", d.id AS "demoId", d.current_revision_id AS "demoRevisionId", d.name,
            s.due_on AS "dueOn", NULL::text AS "viaBriefingTitle"
       FROM assignment_students s JOIN demos d ON d.id = s.demo_id
      WHERE s.school_id = :schoolId AND s.student_id = :studentId AND s.kind = 'demo'
        AND d.deleted_at IS NULL AND d.current_revision_id IS NOT NULL
     UNION ALL
     SELECT s.assignment_id, d.id, brd.demo_revision_id, d.name, s.due_on, br.title
       FROM assignment_students s
       JOIN briefings b ON b.id = s.briefing_id
       JOIN briefing_revisions br ON br.id = b.current_revision_id
       JOIN briefing_revision_demos brd ON brd.briefing_revision_id = br.id
       JOIN demo_revisions dr ON dr.id = brd.demo_revision_id
       JOIN demos d ON d.id = dr.demo_id
      WHERE s.school_id = :schoolId AND s.student_id = :studentId AND s.kind = 'briefing' AND d.deleted_at IS NULL
      ORDER BY "dueOn", name`,
    { replacements: { schoolId, studentId }, type: QueryTypes.SELECT },
  );
}

/** Whether a demo is assigned to a student, directly or through an assigned briefing's current revision. */
export async function isDemoAssignedToStudent(schoolId: string, demoId: string, studentId: string): Promise<boolean> {
  const demos = await listAssignedDemosForStudent(schoolId, studentId);
  return demos.some((d) => d.demoId === demoId);
}

/** Whether a briefing is assigned to a student (directly or through their current cohort). */
export async function isBriefingAssignedToStudent(schoolId: string, briefingId: string, studentId: string): Promise<boolean> {
  const [row] = await sequelize.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM assignment_students WHERE school_id = :schoolId AND briefing_id = :briefingId AND student_id = :studentId`,
    { replacements: { schoolId, briefingId, studentId }, type: QueryTypes.SELECT },
  );
  return (row?.n ?? 0) > 0;
}
