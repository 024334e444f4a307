import "server-only";
import type { Transaction } from "sequelize";
import { Enrolment } from "../../models";

/** Enrols a student on a course at a syllabus revision (the newest active enrolment is the one `active_enrolments` shows). */
export async function enrol(input: { studentId: string; courseId: string; revisionId: string; enrolledOn: string }, t?: Transaction) {
  const e = await Enrolment.create({ ...input, status: "active", endedOn: null, endReason: null }, { transaction: t });
  return { id: e.id };
}
