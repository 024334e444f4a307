import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../index";
import { Course, SyllabusRevision, SyllabusStage, SyllabusItem, type LevelOfLearning } from "../models";

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

export async function createCourse(input: { schoolId: string; code: string; title: string; minGroundMinutes: number }, t?: Transaction) {
  const c = await Course.create(input, { transaction: t });
  return { id: c.id, code: c.code, title: c.title, minGroundMinutes: c.minGroundMinutes };
}

/** A new syllabus revision of a course, numbered after the last one, with its stages and ordered items. */
export async function createSyllabusRevision(
  input: { courseId: string; approvedOn: string | null; effectiveFrom: string | null; changeNote: string; stages: SyllabusStageInput[] },
  t?: Transaction,
) {
  const last = (await SyllabusRevision.max("number", { where: { courseId: input.courseId }, transaction: t })) as number | null;
  const rev = await SyllabusRevision.create(
    { courseId: input.courseId, number: (last ?? 0) + 1, approvedOn: input.approvedOn, effectiveFrom: input.effectiveFrom, changeNote: input.changeNote },
    { transaction: t },
  );
  let stagePos = 0;
  for (const s of input.stages) {
    const stage = await SyllabusStage.create({ revisionId: rev.id, position: ++stagePos, code: s.code, title: s.title }, { transaction: t });
    let itemPos = 0;
    for (const i of s.items) {
      await SyllabusItem.create({ revisionId: rev.id, stageId: stage.id, position: ++itemPos, ...i }, { transaction: t });
    }
  }
  return { id: rev.id, number: rev.number };
}

export interface SyllabusView {
  revisionId: string;
  number: number;
  approvedOn: string | null;
  effectiveFrom: string | null;
  changeNote: string;
  course: { id: string; code: string; title: string; minGroundMinutes: number };
  stages: { id: string; code: string; title: string; items: (SyllabusItemInput & { id: string })[] }[];
}

export async function getSyllabusRevision(schoolId: string, revisionId: string): Promise<SyllabusView | null> {
  const rev = await SyllabusRevision.findByPk(revisionId);
  if (!rev) return null;
  const course = await Course.findOne({ where: { id: rev.courseId, schoolId } });
  if (!course) return null;
  const stages = await SyllabusStage.findAll({ where: { revisionId }, order: [["position", "ASC"]] });
  const items = await SyllabusItem.findAll({ where: { revisionId }, order: [["position", "ASC"]] });
  return {
    revisionId: rev.id,
    number: rev.number,
    approvedOn: rev.approvedOn,
    effectiveFrom: rev.effectiveFrom,
    changeNote: rev.changeNote,
    course: { id: course.id, code: course.code, title: course.title, minGroundMinutes: course.minGroundMinutes },
    stages: stages.map((s) => ({
      id: s.id,
      code: s.code,
      title: s.title,
      items: items
        .filter((i) => i.stageId === s.id)
        .map((i) => ({ id: i.id, code: i.code, title: i.title, objective: i.objective, completionStandard: i.completionStandard, requiredLevel: i.requiredLevel })),
    })),
  };
}

export async function listCoursesWithLatestRevision(schoolId: string) {
  return sequelize.query<{ id: string; code: string; title: string; minGroundMinutes: number; revisionId: string | null; revisionNumber: number | null }>(
    `SELECT c.id, c.code, c.title, c.min_ground_minutes AS "minGroundMinutes",
            r.id AS "revisionId", r.number AS "revisionNumber"
       FROM courses c
       LEFT JOIN LATERAL (SELECT id, number FROM syllabus_revisions WHERE course_id = c.id ORDER BY number DESC LIMIT 1) r ON true
      WHERE c.school_id = :schoolId ORDER BY c.code`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
}
