import "server-only";
import type { Transaction } from "sequelize";
import { sequelize } from "../../index";
import { Person, InstructorQualification } from "../../models";
import { hashPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/auth/roles";
import { HttpError } from "@/lib/http/errors";
import { summary, type PersonSummary } from "./person-summary";

// Creating people (invitations, roster imports, seeds) and recording an instructor's qualification.

export async function createPerson(
  input: {
    schoolId: string;
    name: string;
    email: string;
    roles: Role[];
    password?: string | null;
    /** a bcrypt hash made earlier (seeds and test factories make one hash for many people) */
    passwordHash?: string;
  },
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
      passwordHash: input.passwordHash ?? (input.password ? await hashPassword(input.password) : null),
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
