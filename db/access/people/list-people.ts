import "server-only";
import { Op, QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { Person } from "../../models";
import type { Role } from "@/lib/auth/roles";
import { summary, type PersonSummary } from "./person-summary";

// Reading the school's people and an instructor's qualifications.

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
       FROM instructor_qualifications_current q
       LEFT JOIN instructor_courses_current ic ON ic.person_id = q.person_id
       LEFT JOIN courses c ON c.id = ic.course_id
      WHERE q.person_id = :personId
      GROUP BY q.id ORDER BY q.issued_on`,
    { replacements: { personId }, type: QueryTypes.SELECT },
  );
}
