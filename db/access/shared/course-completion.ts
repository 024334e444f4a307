import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { StudentRef } from "./enrolment";
import { currentSignOffs } from "../records/sign-offs";
import { itemsOfRevision, passedStageIds } from "../records/items";
import { creditedMinutesFor } from "../ground-log/ground-hours";

// What still stands between a student and the end of their course, read once here for every rule
// that asks "has the course been completed?": the knowledge-test endorsement (14 CFR 61.35(a)(1):
// the ground training accomplished) and graduation (14 CFR 141.95(a): the certificate goes to a
// student who completed the approved course, whose outline sets the minimum ground training time,
// 14 CFR 141.55(c)). Each caller words the gaps its own way.

export interface CourseGaps {
  /** codes of syllabus items of the student's revision without a current sign-off */
  unsignedItems: string[];
  /** codes of stages whose stage check is not passed on this enrolment */
  stagesNotPassed: string[];
  /** codes of syllabus items with an open (or scheduled, not yet done) make-up item */
  openMakeups: string[];
  /** credited ground minutes on the course, transfer credit included (`creditedMinutesFor`) */
  creditedMinutes: number;
  /** the course's approved minimum of ground training, in minutes */
  minimumMinutes: number;
}

type Student = Pick<StudentRef, "id" | "enrolmentId" | "courseId" | "revisionId" | "minGroundMinutes">;

export async function courseGaps(student: Student, t?: Transaction): Promise<CourseGaps> {
  const items = await itemsOfRevision(student.revisionId, t);
  const signed = new Set((await currentSignOffs(student.id, t)).map((s) => s.itemId));
  const passed = await passedStageIds(student.id, student.enrolmentId, t);
  const stages = [...new Map(items.map((i) => [i.stageId, i.stageCode])).entries()];
  const makeups = await sequelize.query<{ code: string }>(
    `SELECT DISTINCT i.code FROM makeup_items m JOIN syllabus_items i ON i.id = m.syllabus_item_id
      WHERE m.student_id = :studentId AND m.state IN ('open','scheduled') ORDER BY i.code`,
    { replacements: { studentId: student.id }, type: QueryTypes.SELECT, transaction: t },
  );
  return {
    unsignedItems: items.filter((i) => !signed.has(i.id)).map((i) => i.code),
    stagesNotPassed: stages.filter(([id]) => !passed.has(id)).map(([, code]) => code),
    openMakeups: makeups.map((m) => m.code),
    creditedMinutes: await creditedMinutesFor(student.id, student.courseId, t),
    minimumMinutes: student.minGroundMinutes,
  };
}

/** True when the credited ground time is below the course's minimum. */
export const groundTimeShort = (g: CourseGaps): boolean => g.creditedMinutes < g.minimumMinutes;
