import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../index";
import { Course, SyllabusRevision, SyllabusStage, SyllabusItem, type LevelOfLearning } from "../models";
import { HttpError } from "@/lib/http/errors";

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
        .map((i) => ({
          id: i.id,
          code: i.code,
          title: i.title,
          objective: i.objective,
          completionStandard: i.completionStandard,
          requiredLevel: i.requiredLevel,
        })),
    })),
  };
}

export async function listCoursesWithLatestRevision(schoolId: string) {
  return sequelize.query<{
    id: string;
    code: string;
    title: string;
    minGroundMinutes: number;
    revisionId: string | null;
    revisionNumber: number | null;
  }>(
    `SELECT c.id, c.code, c.title, c.min_ground_minutes AS "minGroundMinutes",
            r.id AS "revisionId", r.number AS "revisionNumber"
       FROM courses c
       LEFT JOIN LATERAL (SELECT id, number FROM syllabus_revisions WHERE course_id = c.id ORDER BY number DESC LIMIT 1) r ON true
      WHERE c.school_id = :schoolId ORDER BY c.code`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
}

// ---- revisions: the chief makes a new one from the current; referenced ones never change ----------

export interface SyllabusRevisionSummary {
  id: string;
  number: number;
  approvedOn: string | null;
  effectiveFrom: string | null;
  changeNote: string;
  createdAt: Date;
  items: number;
  activeEnrolments: number;
  briefingRevisions: number;
  latest: boolean;
}

/** Every revision of a course with what refers to it (active enrolments, briefing revisions). */
export async function listSyllabusRevisions(schoolId: string, courseId: string): Promise<SyllabusRevisionSummary[]> {
  return sequelize.query<SyllabusRevisionSummary>(
    `SELECT r.id, r.number, r.approved_on AS "approvedOn", r.effective_from AS "effectiveFrom", r.change_note AS "changeNote",
            r.created_at AS "createdAt",
            (SELECT count(*)::int FROM syllabus_items i WHERE i.revision_id = r.id) AS items,
            (SELECT count(*)::int FROM enrolments e WHERE e.revision_id = r.id AND e.status = 'active') AS "activeEnrolments",
            (SELECT count(*)::int FROM briefing_revisions b WHERE b.syllabus_revision_id = r.id) AS "briefingRevisions",
            r.number = (SELECT max(number) FROM syllabus_revisions x WHERE x.course_id = r.course_id) AS latest
       FROM syllabus_revisions r JOIN courses c ON c.id = r.course_id
      WHERE c.school_id = :schoolId AND c.id = :courseId
      ORDER BY r.number DESC`,
    { replacements: { schoolId, courseId }, type: QueryTypes.SELECT },
  );
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

export interface EnrolmentOnRevision {
  enrolmentId: string;
  studentId: string;
  studentName: string;
  revisionId: string;
  revisionNumber: number;
  enrolledOn: string;
}

/** Active enrolments on a course, with the revision each one is on. */
export async function listActiveEnrolments(schoolId: string, courseId: string): Promise<EnrolmentOnRevision[]> {
  return sequelize.query<EnrolmentOnRevision>(
    `SELECT e.id AS "enrolmentId", p.id AS "studentId", p.name AS "studentName", r.id AS "revisionId", r.number AS "revisionNumber",
            e.enrolled_on AS "enrolledOn"
       FROM enrolments e JOIN people p ON p.id = e.student_id JOIN syllabus_revisions r ON r.id = e.revision_id
       JOIN courses c ON c.id = e.course_id
      WHERE c.school_id = :schoolId AND c.id = :courseId AND e.status = 'active'
      ORDER BY p.name`,
    { replacements: { schoolId, courseId }, type: QueryTypes.SELECT },
  );
}

/** Moves an enrolment to another revision of the same course (the chief's decision). */
export async function moveEnrolmentToRevision(schoolId: string, enrolmentId: string, revisionId: string, t: Transaction) {
  const [e] = await sequelize.query<{ courseId: string; revisionId: string }>(
    `SELECT e.course_id AS "courseId", e.revision_id AS "revisionId" FROM enrolments e JOIN courses c ON c.id = e.course_id
      WHERE e.id = :enrolmentId AND c.school_id = :schoolId AND e.status = 'active' FOR UPDATE OF e`,
    { replacements: { enrolmentId, schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!e) throw new HttpError(404, "enrolmentId: no such active enrolment", "enrolmentId");
  const target = await SyllabusRevision.findOne({ where: { id: revisionId, courseId: e.courseId }, transaction: t });
  if (!target) throw new HttpError(400, "revisionId: not a revision of the enrolment's course", "revisionId");
  if (e.revisionId === revisionId) return { moved: false, revisionNumber: target.number };
  await sequelize.query(`UPDATE enrolments SET revision_id = :revisionId WHERE id = :enrolmentId`, {
    replacements: { revisionId, enrolmentId },
    transaction: t,
  });
  return { moved: true, revisionNumber: target.number };
}

/** The course most students are on (then by code): what course pickers show first. */
export async function defaultCourseId(schoolId: string): Promise<string | null> {
  const [row] = await sequelize.query<{ id: string }>(
    `SELECT c.id FROM courses c LEFT JOIN enrolments e ON e.course_id = c.id AND e.status = 'active'
      WHERE c.school_id = :schoolId GROUP BY c.id, c.code ORDER BY count(e.id) DESC, c.code LIMIT 1`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
  return row?.id ?? null;
}
