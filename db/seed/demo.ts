import { addDays, format } from "date-fns";
import { sequelize } from "../index";
import { School } from "../models";
import { createSchool } from "../access/shared/school";
import { createPerson, addQualification } from "../access/people/create-person";
import { createCourse } from "../access/syllabus/courses";
import { createSyllabusRevision } from "../access/syllabus/create-revision";
import { createCohort, addToCohort } from "../access/cohorts/memberships";
import { enrol } from "../access/cohorts/enrol";
import { linkSponsor } from "../access/cohorts/sponsor-links";
import { now } from "@/lib/clock";
import { hashPassword } from "@/lib/auth/password";
import { DEMO_PASSWORD, DEMO_SCHOOL, DEMO_STAGES, COHORT_A_STUDENTS, COHORT_B_STUDENTS } from "./scenario";
import { runSeedExtensions } from "./extensions";

const day = (offset: number) => format(addDays(now(), offset), "yyyy-MM-dd");

/**
 * The invented demo scenario, loaded through the same data-access services the app uses.
 * Does nothing when a school already exists (the start command resets by recreating the database).
 */
export async function seedDemo(): Promise<void> {
  if ((await School.count()) > 0) {
    console.log("[seed] demo data already present");
    return;
  }
  await sequelize.transaction(async (t) => {
    const school = await createSchool(
      {
        name: DEMO_SCHOOL.name,
        timeZone: DEMO_SCHOOL.timeZone,
        settings: { authority: DEMO_SCHOOL.authority, mailSenderName: DEMO_SCHOOL.name },
      },
      t,
    );
    const course = await createCourse(
      { schoolId: school.id, code: "PPL-GS", title: "Private pilot ground school", minGroundMinutes: 35 * 60 },
      t,
    );
    const rev = await createSyllabusRevision(
      {
        courseId: course.id,
        approvedOn: day(-200),
        effectiveFrom: day(-180),
        changeNote: "First issue of the ground syllabus.",
        stages: DEMO_STAGES,
      },
      t,
    );
    // one real hash of the demo password for every demo account (a hash each cost seconds in all)
    const passwordHash = await hashPassword(DEMO_PASSWORD);
    const mk = (name: string, email: string, roles: ("chief" | "instructor" | "student" | "sponsor")[]) =>
      createPerson({ schoolId: school.id, name, email, roles, passwordHash }, t);

    const chief = await mk("Imogen Farrant", "chief@chalkwing.test", ["chief", "instructor"]);
    const tomasz = await mk("Tomasz Varga", "instructor@chalkwing.test", ["instructor"]);
    const priya = await mk("Priya Okonjo-Hale", "priya.okonjo-hale@chalkwing.test", ["instructor"]);
    const rafael = await mk("Rafael Lindqvist", "rafael.lindqvist@chalkwing.test", ["instructor", "sponsor"]);

    const quals: [string, string, boolean, number][] = [
      [chief.id, "LHV-GI-0007", true, -90],
      [tomasz.id, "LHV-GI-0142", false, -40],
      [priya.id, "LHV-GI-0188", false, -400],
      [rafael.id, "LHV-GI-0093", true, -700],
    ];
    for (const [personId, number, checkInstructor, recency] of quals) {
      await addQualification(
        {
          personId,
          certificateKind: "Ground instructor",
          certificateNumber: number,
          ratings: ["Principles of flight", "Meteorology", "Navigation"],
          checkInstructor,
          issuedOn: day(-1500),
          recencyOn: day(recency),
          recencyMonths: 24,
          courseIds: [course.id],
        },
        t,
      );
    }

    const cohortA = await createCohort(
      { schoolId: school.id, courseId: course.id, name: "Kestrel cohort", leadInstructorId: tomasz.id, startsOn: day(-56) },
      t,
    );
    const cohortB = await createCohort(
      { schoolId: school.id, courseId: course.id, name: "Merlin cohort", leadInstructorId: priya.id, startsOn: day(-21) },
      t,
    );

    const students: Record<string, string> = {};
    for (const [list, cohort, start] of [
      [COHORT_A_STUDENTS, cohortA, -56],
      [COHORT_B_STUDENTS, cohortB, -21],
    ] as const) {
      for (const s of list) {
        const p = await mk(s.name, s.email, ["student"]);
        students[s.email] = p.id;
        await addToCohort({ cohortId: cohort.id, studentId: p.id, fromDate: day(start) }, t);
        await enrol({ studentId: p.id, courseId: course.id, revisionId: rev.id, enrolledOn: day(start - 3) }, t);
      }
    }

    const sponsor = await mk("Marian Quill", "sponsor@chalkwing.test", ["sponsor"]);
    await linkSponsor({ sponsorId: sponsor.id, studentId: students["student@chalkwing.test"]!, relationship: "parent" }, t);
    const sponsor2 = await mk("Hollis Brandt", "hollis.brandt@chalkwing.test", ["sponsor"]);
    await linkSponsor(
      { sponsorId: sponsor2.id, studentId: students["noor.brandt@chalkwing.test"]!, relationship: "parent", shares: { progress: false } },
      t,
    );
    const airline = await mk("Fenwick Air Cadet Fund", "bursary@fenwick-fund.test", ["sponsor"]);
    await linkSponsor({ sponsorId: airline.id, studentId: students["kofi.mensah@chalkwing.test"]!, relationship: "bursary" }, t);
    await linkSponsor(
      { sponsorId: airline.id, studentId: students["elin.haugen@chalkwing.test"]!, relationship: "bursary", weeklyLetter: false },
      t,
    );
    await linkSponsor({ sponsorId: rafael.id, studentId: students["lotte.lindqvist@chalkwing.test"]!, relationship: "parent" }, t);

    await runSeedExtensions({
      t,
      schoolId: school.id,
      courseId: course.id,
      revisionId: rev.id,
      people: { chief: chief.id, instructor: tomasz.id, priya: priya.id, rafael: rafael.id, sponsor: sponsor.id },
      students,
      cohorts: { a: cohortA.id, b: cohortB.id },
      day,
    });
  });
  console.log("[seed] demo scenario loaded");
}
