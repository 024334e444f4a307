import "server-only";
import { Op, QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../index";
import { Person, InstructorQualification } from "../models";
import { hashPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/auth/roles";
import { HttpError } from "@/lib/http/errors";
import { bumpSessionVersion } from "./sign-in";

export interface PersonSummary {
  id: string;
  name: string;
  email: string;
  roles: Role[];
  active: boolean;
}

function summary(p: Person): PersonSummary {
  return { id: p.id, name: p.name, email: p.email, roles: p.roles, active: p.active };
}

export async function createPerson(
  input: { schoolId: string; name: string; email: string; roles: Role[]; password?: string | null },
  t?: Transaction,
): Promise<PersonSummary> {
  const taken = await Person.findOne({
    where: sequelize.where(sequelize.fn("lower", sequelize.col("email")), input.email.trim().toLowerCase()),
    transaction: t,
  });
  if (taken) throw new HttpError(409, "email: already belongs to an account", "email");
  const p = await Person.create(
    {
      schoolId: input.schoolId,
      name: input.name.trim(),
      email: input.email.trim().toLowerCase(),
      roles: [...new Set(input.roles)],
      passwordHash: input.password ? await hashPassword(input.password) : null,
    },
    { transaction: t },
  );
  return summary(p);
}

export async function addQualification(
  input: {
    personId: string;
    certificateKind: string;
    certificateNumber: string;
    ratings: string[];
    checkInstructor?: boolean;
    issuedOn: string;
    recencyOn: string;
    recencyMonths?: number;
    courseIds: string[];
  },
  t?: Transaction,
) {
  const q = await InstructorQualification.create(
    {
      personId: input.personId,
      certificateKind: input.certificateKind,
      certificateNumber: input.certificateNumber,
      ratings: input.ratings,
      checkInstructor: input.checkInstructor ?? false,
      issuedOn: input.issuedOn,
      recencyOn: input.recencyOn,
      recencyMonths: input.recencyMonths ?? 24,
    },
    { transaction: t },
  );
  for (const courseId of input.courseIds) {
    await sequelize.query(`INSERT INTO instructor_courses (person_id, course_id) VALUES (:p, :c) ON CONFLICT DO NOTHING`, {
      replacements: { p: input.personId, c: courseId },
      transaction: t,
    });
  }
  return { id: q.id };
}

/** Changing roles ends the person's sessions, so a removed role stops working at once. */
export async function setRoles(schoolId: string, personId: string, roles: Role[]) {
  const [count] = await Person.update({ roles: [...new Set(roles)], updatedAt: new Date() }, { where: { id: personId, schoolId } });
  if (!count) throw new HttpError(404, "Person not found");
  await bumpSessionVersion(personId);
}

export async function setActive(schoolId: string, personId: string, active: boolean) {
  const [count] = await Person.update({ active, updatedAt: new Date() }, { where: { id: personId, schoolId } });
  if (!count) throw new HttpError(404, "Person not found");
  await bumpSessionVersion(personId);
}

export async function changePassword(personId: string, password: string) {
  const hash = await hashPassword(password);
  await Person.update({ passwordHash: hash, updatedAt: new Date() }, { where: { id: personId } });
  await bumpSessionVersion(personId);
}

export async function listPeople(schoolId: string, filter: { role?: Role; q?: string } = {}): Promise<PersonSummary[]> {
  const where: Record<string | symbol, unknown> = { schoolId };
  if (filter.role) where.roles = { [Op.contains]: [filter.role] };
  if (filter.q) where[Op.or] = [{ name: { [Op.iLike]: `%${filter.q}%` } }, { email: { [Op.iLike]: `%${filter.q}%` } }];
  const rows = await Person.findAll({ where, order: [["name", "ASC"]] });
  return rows.map(summary);
}

export async function getPersonInSchool(schoolId: string, personId: string): Promise<PersonSummary | null> {
  const p = await Person.findOne({ where: { id: personId, schoolId } });
  return p ? summary(p) : null;
}

export interface QualificationSummary {
  certificateKind: string;
  certificateNumber: string;
  ratings: string[];
  checkInstructor: boolean;
  recencyOn: string;
  recencyMonths: number;
  courses: string[];
}

export async function listQualifications(personId: string): Promise<QualificationSummary[]> {
  return sequelize.query<QualificationSummary>(
    `SELECT q.certificate_kind AS "certificateKind", q.certificate_number AS "certificateNumber", q.ratings,
            q.check_instructor AS "checkInstructor", q.recency_on AS "recencyOn", q.recency_months AS "recencyMonths",
            COALESCE(array_agg(c.code ORDER BY c.code) FILTER (WHERE c.code IS NOT NULL), '{}') AS courses
       FROM instructor_qualifications q
       LEFT JOIN instructor_courses ic ON ic.person_id = q.person_id
       LEFT JOIN courses c ON c.id = ic.course_id
      WHERE q.person_id = :personId
      GROUP BY q.id ORDER BY q.issued_on`,
    { replacements: { personId }, type: QueryTypes.SELECT },
  );
}
