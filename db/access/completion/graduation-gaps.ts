import "server-only";
import type { Transaction } from "sequelize";
import type { StudentRef } from "../shared/enrolment";
import { courseGaps, groundTimeShort } from "../shared/course-completion";
import { hoursLabel } from "@/lib/time";

// What is missing for graduation, in words: the graduation certificate goes to a student who
// completed the approved course (14 CFR 141.95(a)), that is every syllabus item signed off, every
// stage check passed, no make-up item left open, and the course's approved minimum of ground
// training time credited (14 CFR 141.55(c); transfer credit counts, 141.77(c)). Read through the
// shared `courseGaps`, the same read as the knowledge-test endorsement's preconditions.

const LISTED = 12;
const list = (codes: string[]) => (codes.length > LISTED ? `${codes.slice(0, LISTED).join(", ")}, …` : codes.join(", "));

/** Each unmet condition of graduation as a short phrase; [] when the student may graduate. */
export async function graduationGaps(
  student: Pick<StudentRef, "id" | "enrolmentId" | "courseId" | "revisionId" | "minGroundMinutes">,
  t?: Transaction,
): Promise<string[]> {
  const g = await courseGaps(student, t);
  const gaps: string[] = [];
  if (g.unsignedItems.length) gaps.push(`items not signed off: ${list(g.unsignedItems)}`);
  if (g.stagesNotPassed.length) gaps.push(`stage checks not passed: ${list(g.stagesNotPassed)}`);
  if (g.openMakeups.length) gaps.push(`open make-up items: ${list(g.openMakeups)}`);
  if (groundTimeShort(g))
    gaps.push(`credited ground time ${hoursLabel(g.creditedMinutes)} of the course's ${hoursLabel(g.minimumMinutes)} minimum`);
  return gaps;
}
