import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { Course, SyllabusRevision, SyllabusStage, SyllabusItem } from "../../models";
import type { SyllabusItemInput } from "./create-revision";

// Reading syllabus revisions: one revision with its stages and items, and a course's revisions
// with what refers to them.

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
