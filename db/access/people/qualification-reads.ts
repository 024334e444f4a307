import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { rolesWith } from "@/lib/auth/permissions";
import type { QualificationFields } from "./qualification-history";

// Reading instructor files: the history of versions and course grants, recency falling due, the
// certificate number in force on a day, and who certifies records. Written by qualification-history.ts.

export interface QualificationVersion extends QualificationFields {
  id: string;
  qualificationId: string;
  version: number;
  validFrom: string;
  validTo: string | null;
  recordedByName: string | null;
  recordedAt: Date;
  changeNote: string;
}

export interface CourseGrant {
  courseId: string;
  code: string;
  validFrom: string | null;
  validTo: string | null;
  recordedByName: string | null;
}

/** An instructor's file: every version of every qualification (newest first) and every course grant. */
export async function qualificationHistory(
  schoolId: string,
  personId: string,
): Promise<{ versions: QualificationVersion[]; courses: CourseGrant[] }> {
  const versions = await sequelize.query<QualificationVersion>(
    `SELECT q.id, q.qualification_id AS "qualificationId", q.version, q.certificate_kind AS "certificateKind",
            q.certificate_number AS "certificateNumber", q.ratings, q.check_instructor AS "checkInstructor",
            q.issued_on::text AS "issuedOn", q.recency_on::text AS "recencyOn", q.recency_months AS "recencyMonths",
            q.valid_from::text AS "validFrom", q.valid_to::text AS "validTo", r.name AS "recordedByName", q.created_at AS "recordedAt",
            q.change_note AS "changeNote"
       FROM instructor_qualifications q JOIN people p ON p.id = q.person_id LEFT JOIN people r ON r.id = q.recorded_by
      WHERE q.person_id = :p AND p.school_id = :s
      ORDER BY q.issued_on, q.qualification_id, q.version DESC`,
    { replacements: { p: personId, s: schoolId }, type: QueryTypes.SELECT },
  );
  const courses = await sequelize.query<CourseGrant>(
    `SELECT ic.course_id AS "courseId", c.code,
            CASE WHEN ic.valid_from = '-infinity' THEN NULL ELSE ic.valid_from::text END AS "validFrom",
            ic.valid_to::text AS "validTo", r.name AS "recordedByName"
       FROM instructor_courses ic JOIN courses c ON c.id = ic.course_id LEFT JOIN people r ON r.id = ic.recorded_by
      WHERE ic.person_id = :p AND c.school_id = :s
      ORDER BY c.code, ic.valid_from DESC`,
    { replacements: { p: personId, s: schoolId }, type: QueryTypes.SELECT },
  );
  return { versions, courses };
}

/** Instructors whose recency date falls within `days` of today (or has passed), for the chief's Today. */
export async function recencyDueSoon(
  schoolId: string,
  today: string,
  days = 30,
): Promise<{ personId: string; name: string; certificateNumber: string; dueOn: string; daysLeft: number }[]> {
  return sequelize.query(
    `SELECT p.id AS "personId", p.name, q.certificate_number AS "certificateNumber", d.due::text AS "dueOn",
            (d.due - CAST(:today AS date))::int AS "daysLeft"
       FROM instructor_qualifications_current q JOIN people p ON p.id = q.person_id
       CROSS JOIN LATERAL (SELECT (q.recency_on + make_interval(months => q.recency_months))::date AS due) d
      WHERE p.school_id = :s AND p.active AND d.due <= CAST(:today AS date) + :days
      ORDER BY d.due, p.name`,
    { replacements: { s: schoolId, today, days }, type: QueryTypes.SELECT },
  );
}

/** The school's courses, for the choice of courses an instructor may teach. */
export async function schoolCourses(schoolId: string): Promise<{ id: string; code: string; title: string }[]> {
  return sequelize.query(`SELECT id, code, title FROM courses WHERE school_id = :s ORDER BY code`, {
    replacements: { s: schoolId },
    type: QueryTypes.SELECT,
  });
}

/** The certificate numbers a person held on `onDate` (the versions in force that day), joined by ", ". */
export async function certificateNumbersOn(personId: string, onDate: string): Promise<string | null> {
  const [r] = await sequelize.query<{ numbers: string | null }>(
    `SELECT string_agg(certificate_number, ', ' ORDER BY issued_on, certificate_number) AS numbers FROM instructor_qualifications
      WHERE person_id = :p AND valid_from <= CAST(:d AS date) AND (valid_to IS NULL OR CAST(:d AS date) < valid_to)`,
    { replacements: { p: personId, d: onDate }, type: QueryTypes.SELECT },
  );
  return r?.numbers ?? null;
}

/**
 * Who certifies a printed training record: the viewer when they hold `records.certify`, otherwise
 * the school's first active holder by name; with the certificate numbers in force today.
 */
export async function certifyingInstructor(
  schoolId: string,
  viewerId: string,
  today: string,
): Promise<{ name: string; certificateNumber: string | null } | null> {
  const [r] = await sequelize.query<{ id: string; name: string }>(
    `SELECT id, name FROM people WHERE school_id = :s AND active AND roles && CAST(:roles AS text[])
      ORDER BY (id = :viewer) DESC, name LIMIT 1`,
    { replacements: { s: schoolId, viewer: viewerId, roles: `{${rolesWith("records.certify").join(",")}}` }, type: QueryTypes.SELECT },
  );
  if (!r) return null;
  return { name: r.name, certificateNumber: await certificateNumbersOn(r.id, today) };
}
