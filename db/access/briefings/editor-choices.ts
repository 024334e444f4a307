import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";

// What the briefing editor offers: courses, syllabus revisions with their items, and demos.

export interface EditorChoices {
  courses: { id: string; code: string; title: string }[];
  syllabusRevisions: {
    id: string;
    courseId: string;
    number: number;
    items: { id: string; code: string; title: string; stage: string }[];
  }[];
  demos: { demoRevisionId: string; name: string; revisionNumber: number; current: boolean }[];
}

/** Courses, their syllabus revisions with items, and the school's demos (current revisions plus any `pinned`). */
export async function editorChoices(schoolId: string, pinnedDemoRevisionIds: string[] = []): Promise<EditorChoices> {
  const courses = await sequelize.query<EditorChoices["courses"][number]>(
    `SELECT id, code, title FROM courses WHERE school_id = :schoolId ORDER BY code`,
    {
      replacements: { schoolId },
      type: QueryTypes.SELECT,
    },
  );
  const items = await sequelize.query<{
    revId: string;
    courseId: string;
    number: number;
    id: string;
    code: string;
    title: string;
    stage: string;
  }>(
    `SELECT r.id AS "revId", r.course_id AS "courseId", r.number, i.id, i.code, i.title, s.title AS stage
       FROM syllabus_revisions r JOIN courses c ON c.id = r.course_id
       JOIN syllabus_items i ON i.revision_id = r.id JOIN syllabus_stages s ON s.id = i.stage_id
      WHERE c.school_id = :schoolId ORDER BY r.number DESC, s.position, i.position`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
  const revs = new Map<string, EditorChoices["syllabusRevisions"][number]>();
  for (const i of items) {
    const r = revs.get(i.revId) ?? { id: i.revId, courseId: i.courseId, number: i.number, items: [] };
    r.items.push({ id: i.id, code: i.code, title: i.title, stage: i.stage });
    revs.set(i.revId, r);
  }
  const demos = await sequelize.query<EditorChoices["demos"][number]>(
    `SELECT dr.id AS "demoRevisionId", d.name, dr.number AS "revisionNumber", (d.current_revision_id = dr.id) AS current
       FROM demo_revisions dr JOIN demos d ON d.id = dr.demo_id
      WHERE d.school_id = :schoolId AND d.deleted_at IS NULL
        AND (d.current_revision_id = dr.id OR dr.id IN (:pinned))
      ORDER BY d.name, dr.number DESC`,
    {
      replacements: {
        schoolId,
        pinned: pinnedDemoRevisionIds.length ? pinnedDemoRevisionIds : ["00000000-0000-0000-0000-000000000000"],
      },
      type: QueryTypes.SELECT,
    },
  );
  return { courses, syllabusRevisions: [...revs.values()], demos };
}
