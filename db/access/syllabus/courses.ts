import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { Course } from "../../models";

// A school's courses: creating one, listing them with their latest syllabus revision, and the
// course pickers' default.

export async function createCourse(input: { schoolId: string; code: string; title: string; minGroundMinutes: number }, t?: Transaction) {
  const c = await Course.create(input, { transaction: t });
  return { id: c.id, code: c.code, title: c.title, minGroundMinutes: c.minGroundMinutes };
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

/** The course most students are on (then by code): what course pickers show first. */
export async function defaultCourseId(schoolId: string): Promise<string | null> {
  const [row] = await sequelize.query<{ id: string }>(
    `SELECT c.id FROM courses c LEFT JOIN active_enrolments e ON e.course_id = c.id
      WHERE c.school_id = :schoolId GROUP BY c.id, c.code ORDER BY count(e.id) DESC, c.code LIMIT 1`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
  return row?.id ?? null;
}
