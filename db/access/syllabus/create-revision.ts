import "server-only";
import type { Transaction } from "sequelize";
import { Course, SyllabusRevision, SyllabusStage, SyllabusItem, type LevelOfLearning } from "../../models";
import { HttpError } from "@/lib/http/errors";

// Syllabus revisions: a course's syllabus is never changed, each change is the next numbered revision.

export interface SyllabusItemInput {
  code: string;
  title: string;
  objective: string;
  completionStandard: string;
  requiredLevel: LevelOfLearning;
}
export interface SyllabusStageInput {
  code: string;
  title: string;
  items: SyllabusItemInput[];
}

/** A new syllabus revision of a course, numbered after the last one, with its stages and ordered items. */
export async function createSyllabusRevision(
  input: { courseId: string; approvedOn: string | null; effectiveFrom: string | null; changeNote: string; stages: SyllabusStageInput[] },
  t?: Transaction,
) {
  const last = (await SyllabusRevision.max("number", { where: { courseId: input.courseId }, transaction: t })) as number | null;
  const rev = await SyllabusRevision.create(
    {
      courseId: input.courseId,
      number: (last ?? 0) + 1,
      approvedOn: input.approvedOn,
      effectiveFrom: input.effectiveFrom,
      changeNote: input.changeNote,
    },
    { transaction: t },
  );
  let stagePos = 0;
  for (const s of input.stages) {
    const stage = await SyllabusStage.create(
      { revisionId: rev.id, position: ++stagePos, code: s.code, title: s.title },
      { transaction: t },
    );
    let itemPos = 0;
    for (const i of s.items) {
      await SyllabusItem.create({ revisionId: rev.id, stageId: stage.id, position: ++itemPos, ...i }, { transaction: t });
    }
  }
  return { id: rev.id, number: rev.number };
}

/** A new revision of a course of this school (the previous ones stay as they were). */
export async function createSyllabusRevisionForSchool(
  schoolId: string,
  input: { courseId: string; approvedOn: string | null; effectiveFrom: string | null; changeNote: string; stages: SyllabusStageInput[] },
  t: Transaction,
) {
  const course = await Course.findOne({ where: { id: input.courseId, schoolId }, transaction: t, lock: t.LOCK.UPDATE });
  if (!course) throw new HttpError(404, "courseId: no such course", "courseId");
  const codes = input.stages.flatMap((s) => s.items.map((i) => i.code.toUpperCase()));
  const dup = codes.find((c, i) => codes.indexOf(c) !== i);
  if (dup) throw new HttpError(400, `stages: item code ${dup} is used twice`, "stages");
  const stageCodes = input.stages.map((s) => s.code.toUpperCase());
  const dupStage = stageCodes.find((c, i) => stageCodes.indexOf(c) !== i);
  if (dupStage) throw new HttpError(400, `stages: stage code ${dupStage} is used twice`, "stages");
  return createSyllabusRevision(input, t);
}
