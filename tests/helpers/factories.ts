import { randomUUID } from "node:crypto";
import { sequelize } from "@/db/index";
import { createSchool } from "@/db/access/shared/school";
import { createPerson, addQualification } from "@/db/access/people/create-person";
import { createCourse } from "@/db/access/syllabus/courses";
import { createSyllabusRevision } from "@/db/access/syllabus/create-revision";
import { createCohort, addToCohort } from "@/db/access/cohorts/memberships";
import { enrol } from "@/db/access/cohorts/enrol";
import { linkSponsor } from "@/db/access/cohorts/sponsor-links";
import type { CurrentUser } from "@/lib/auth/session";
import type { Role } from "@/lib/auth/roles";
import { DEMO_STAGES } from "@/db/seed/scenario";
import { hashPassword } from "@/lib/auth/password";

/** Runs in-process code (actions, data access) as this person; null = signed out. */
export function actAs(user: CurrentUser | null): void {
  (globalThis as { __chalkwingTestUser?: CurrentUser | null }).__chalkwingTestUser = user;
}

export const TEST_PASSWORD = "test-password-123";
// One real bcrypt hash of TEST_PASSWORD per test file, shared by every person the factories make
// (hashing it for each person cost a quarter of a second apiece).
let testHash: Promise<string> | undefined;
export const testPasswordHash = () => (testHash ??= hashPassword(TEST_PASSWORD));

/**
 * A fresh, isolated school for one test file: a chief, two instructors, a course with the
 * demo syllabus, two cohorts with three students each, and a sponsor of the first student.
 * Integration tests share one database, so each builds its own school and never assumes counts.
 */
export async function makeSchool(label = "t") {
  const tag = `${label}-${randomUUID().slice(0, 8)}`;
  return sequelize.transaction(async (t) => {
    const school = await createSchool({ name: `Test school ${tag}`, timeZone: "Europe/London" }, t);
    const course = await createCourse({ schoolId: school.id, code: `C-${tag}`, title: "Test ground course", minGroundMinutes: 35 * 60 }, t);
    const rev = await createSyllabusRevision(
      { courseId: course.id, approvedOn: "2026-01-01", effectiveFrom: "2026-01-01", changeNote: "test", stages: DEMO_STAGES },
      t,
    );
    const person = async (name: string, roles: Role[]) =>
      createPerson(
        {
          schoolId: school.id,
          name,
          email: `${name.toLowerCase().replace(/\W+/g, ".")}.${tag}@chalkwing.test`,
          roles,
          passwordHash: await testPasswordHash(),
        },
        t,
      );
    const chief = await person("Chief", ["chief", "instructor"]);
    const instructor = await person("Instructor One", ["instructor"]);
    const instructor2 = await person("Instructor Two", ["instructor"]);
    for (const p of [chief, instructor, instructor2]) {
      await addQualification(
        {
          personId: p.id,
          certificateKind: "Ground instructor",
          certificateNumber: `GI-${p.id.slice(0, 6)}`,
          ratings: [],
          issuedOn: "2020-01-01",
          recencyOn: "2026-01-01",
          recencyMonths: 24,
          courseIds: [course.id],
          checkInstructor: p === chief,
        },
        t,
      );
    }
    const cohortA = await createCohort(
      { schoolId: school.id, courseId: course.id, name: `A ${tag}`, leadInstructorId: instructor.id, startsOn: "2026-09-01" },
      t,
    );
    const cohortB = await createCohort(
      { schoolId: school.id, courseId: course.id, name: `B ${tag}`, leadInstructorId: instructor2.id, startsOn: "2026-09-01" },
      t,
    );
    const students = [];
    for (const [i, cohort] of [cohortA, cohortA, cohortA, cohortB, cohortB, cohortB].entries()) {
      const s = await person(`Student ${i + 1}`, ["student"]);
      await addToCohort({ cohortId: cohort.id, studentId: s.id, fromDate: "2026-09-01" }, t);
      await enrol({ studentId: s.id, courseId: course.id, revisionId: rev.id, enrolledOn: "2026-08-30" }, t);
      students.push(s);
    }
    const sponsor = await person("Sponsor", ["sponsor"]);
    await linkSponsor({ sponsorId: sponsor.id, studentId: students[0]!.id }, t);
    const u = (p: { id: string; name: string; roles: Role[] }): CurrentUser => ({
      id: p.id,
      name: p.name,
      roles: p.roles,
      schoolId: school.id,
    });
    return {
      tag,
      school,
      course,
      revision: rev,
      cohorts: { a: cohortA, b: cohortB },
      people: { chief, instructor, instructor2, sponsor, students },
      as: {
        chief: u(chief),
        instructor: u(instructor),
        instructor2: u(instructor2),
        sponsor: u(sponsor),
        student: u(students[0]!),
        otherStudent: u(students[3]!),
      },
    };
  });
}

export async function closeDb(): Promise<void> {
  await sequelize.close();
}
