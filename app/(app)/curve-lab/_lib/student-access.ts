import "server-only";
import { listAssignedDemosForStudent } from "@/db/access/assignments/assigned-to-student";

/**
 * Which revision of a demo a student was given (directly assigned: the current revision; through a
 * briefing: the revision that briefing revision holds), or null when the demo is not theirs.
 */
export async function assignedRevisionFor(schoolId: string, demoId: string, studentId: string): Promise<string | null> {
  const mine = await listAssignedDemosForStudent(schoolId, studentId);
  return mine.find((d) => d.demoId === demoId)?.demoRevisionId ?? null;
}

/** Whether the student may open this revision of the demo: it must be among the revisions assigned to them. */
export async function studentMayOpenRevision(schoolId: string, demoRevisionId: string, studentId: string): Promise<boolean> {
  const mine = await listAssignedDemosForStudent(schoolId, studentId);
  return mine.some((d) => d.demoRevisionId === demoRevisionId);
}
