import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { rolesWith } from "@/lib/auth/permissions";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone, formatDay } from "@/lib/time";
import type { QualificationInput } from "@/lib/people/schema";
import { getSchool } from "../shared/school";
import { writeAudit } from "../records/audit-chain";

// Instructor files with history (migration 0520): a change closes the version in force and
// appends the next; course grants are closed and added the same way. Nothing is deleted.

/** Roles whose holders keep an instructor file: those who may sign off items. */
const QUALIFIED_ROLES = rolesWith("records.sign");

export interface VersionRow {
  id: string;
  qualification_id: string;
  person_id: string;
  version: number;
  certificate_kind: string;
  certificate_number: string;
  ratings: string[];
  check_instructor: boolean;
  issued_on: string;
  recency_on: string;
  recency_months: number;
  valid_from: string;
}

export interface QualificationFields {
  certificateKind: string;
  certificateNumber: string;
  ratings: string[];
  checkInstructor: boolean;
  issuedOn: string;
  recencyOn: string;
  recencyMonths: number;
}

export function qualificationFieldsOf(r: VersionRow): QualificationFields {
  return {
    certificateKind: r.certificate_kind,
    certificateNumber: r.certificate_number,
    ratings: r.ratings,
    checkInstructor: r.check_instructor,
    issuedOn: r.issued_on,
    recencyOn: r.recency_on,
    recencyMonths: r.recency_months,
  };
}

/** The open versions of a person's qualifications, locked for a change. */
export async function openVersions(personId: string, t: Transaction, qualificationId?: string): Promise<VersionRow[]> {
  return sequelize.query<VersionRow>(
    `SELECT id, qualification_id, person_id, version, certificate_kind, certificate_number, ratings, check_instructor,
            issued_on::text AS issued_on, recency_on::text AS recency_on, recency_months, valid_from::text AS valid_from
       FROM instructor_qualifications
      WHERE person_id = :p AND valid_to IS NULL AND (CAST(:q AS uuid) IS NULL OR qualification_id = CAST(:q AS uuid))
      ORDER BY issued_on, id FOR UPDATE`,
    { replacements: { p: personId, q: qualificationId ?? null }, type: QueryTypes.SELECT, transaction: t },
  );
}

/**
 * Appends a version of a qualification in force from `effectiveFrom`: closes `open` (if any) on that
 * date and inserts the next version. Returns the new version's id and number.
 */
export async function appendQualificationVersion(
  t: Transaction,
  p: {
    personId: string;
    open: VersionRow | null;
    fields: QualificationFields;
    effectiveFrom: string;
    recordedBy: string;
    changeNote: string;
  },
): Promise<{ id: string; qualificationId: string; version: number }> {
  if (p.open) {
    if (p.effectiveFrom < p.open.valid_from)
      throw new HttpError(
        400,
        `effectiveFrom: must be on or after ${formatDay(p.open.valid_from)}, when the version in force began`,
        "effectiveFrom",
      );
    await sequelize.query(`UPDATE instructor_qualifications SET valid_to = :d WHERE id = :id AND valid_to IS NULL`, {
      replacements: { d: p.effectiveFrom, id: p.open.id },
      transaction: t,
    });
  }
  const [row] = await sequelize.query<{ id: string; qualification_id: string; version: number }>(
    `INSERT INTO instructor_qualifications (person_id, qualification_id, version, certificate_kind, certificate_number, ratings,
                                           check_instructor, issued_on, recency_on, recency_months, valid_from, recorded_by, change_note)
     VALUES (:p, :q, :v, :kind, :number, CAST(:ratings AS text[]), :check, :issued, :recency, :months, :from, :by, :note)
     RETURNING id, qualification_id, version`,
    {
      replacements: {
        p: p.personId,
        q: p.open?.qualification_id ?? null,
        v: (p.open?.version ?? 0) + 1,
        kind: p.fields.certificateKind,
        number: p.fields.certificateNumber,
        ratings: `{${p.fields.ratings.map((r) => `"${r.replace(/["\\]/g, "\\$&")}"`).join(",")}}`,
        check: p.fields.checkInstructor,
        issued: p.fields.issuedOn,
        recency: p.fields.recencyOn,
        months: p.fields.recencyMonths,
        from: p.effectiveFrom,
        by: p.recordedBy,
        note: p.changeNote,
      },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  if (!row) throw new Error("qualification version not written");
  return { id: row.id, qualificationId: row.qualification_id, version: row.version };
}

/** Closes the course grants no longer wanted and adds the new ones, from `effectiveFrom`. */
async function reviseCourses(t: Transaction, schoolId: string, personId: string, courseIds: string[], effectiveFrom: string, by: string) {
  const known = await sequelize.query<{ id: string }>(`SELECT id FROM courses WHERE school_id = :s AND id IN (:ids)`, {
    replacements: { s: schoolId, ids: courseIds.length ? courseIds : ["00000000-0000-0000-0000-000000000000"] },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (known.length !== new Set(courseIds).size) throw new HttpError(400, "courseIds: not a course of this school", "courseIds");
  const open = await sequelize.query<{ id: string; course_id: string; valid_from: string }>(
    `SELECT id, course_id, valid_from::text FROM instructor_courses WHERE person_id = :p AND valid_to IS NULL FOR UPDATE`,
    { replacements: { p: personId }, type: QueryTypes.SELECT, transaction: t },
  );
  const wanted = new Set(courseIds);
  const before = open.map((o) => o.course_id);
  for (const o of open.filter((o) => !wanted.has(o.course_id))) {
    await sequelize.query(`UPDATE instructor_courses SET valid_to = GREATEST(valid_from, CAST(:d AS date)) WHERE id = :id`, {
      replacements: { d: effectiveFrom, id: o.id },
      transaction: t,
    });
  }
  for (const c of wanted) {
    if (before.includes(c)) continue;
    await sequelize.query(
      `INSERT INTO instructor_courses (person_id, course_id, valid_from, recorded_by) VALUES (:p, :c, :d, :by) ON CONFLICT DO NOTHING`,
      { replacements: { p: personId, c, d: effectiveFrom, by }, transaction: t },
    );
  }
  return { before: [...before].sort(), after: [...wanted].sort() };
}

/**
 * The chief adds a qualification (no `qualificationId`) or records a change to one, in force from
 * `effectiveFrom` (not after today), with the courses the instructor may teach. Audited in `t`.
 */
export async function reviseQualification(t: Transaction, user: CurrentUser, input: QualificationInput) {
  const [person] = await sequelize.query<{ id: string; name: string }>(
    `SELECT id, name FROM people WHERE id = :id AND school_id = :s AND roles && CAST(:roles AS text[])`,
    {
      replacements: { id: input.personId, s: user.schoolId, roles: `{${QUALIFIED_ROLES.join(",")}}` },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  if (!person) throw new HttpError(404, "personId: no such instructor", "personId");
  const school = await getSchool(user.schoolId, t);
  const today = dateInZone(now(), school.timeZone);
  if (input.effectiveFrom > today) throw new HttpError(400, "effectiveFrom: cannot be in the future", "effectiveFrom");
  let open: VersionRow | null = null;
  if (input.qualificationId) {
    [open = null] = await openVersions(person.id, t, input.qualificationId);
    if (!open) throw new HttpError(404, "qualificationId: no such qualification of this instructor", "qualificationId");
  }
  const fields: QualificationFields = {
    certificateKind: input.certificateKind,
    certificateNumber: input.certificateNumber,
    ratings: input.ratings,
    checkInstructor: input.checkInstructor,
    issuedOn: input.issuedOn,
    recencyOn: input.recencyOn,
    recencyMonths: input.recencyMonths,
  };
  const written = await appendQualificationVersion(t, {
    personId: person.id,
    open,
    fields,
    effectiveFrom: input.effectiveFrom,
    recordedBy: user.id,
    changeNote: input.changeNote,
  });
  const courses = await reviseCourses(t, user.schoolId, person.id, input.courseIds, input.effectiveFrom, user.id);
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: open ? "qualification.revised" : "qualification.added",
    recordType: "instructor_qualification",
    recordId: written.id,
    before: open
      ? { ...qualificationFieldsOf(open), version: open.version, validFrom: open.valid_from, courseIds: courses.before }
      : undefined,
    after: {
      ...fields,
      personId: person.id,
      qualificationId: written.qualificationId,
      version: written.version,
      effectiveFrom: input.effectiveFrom,
      changeNote: input.changeNote,
      courseIds: courses.after,
    },
  });
  return written;
}
