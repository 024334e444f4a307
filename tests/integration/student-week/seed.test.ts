import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { Assignment } from "@/db/models";
import { makeSchool, actAs, closeDb } from "@/tests/helpers/factories";
import { saveDemoAction } from "@/app/(app)/curve-lab/actions";
import { createAirframeAction } from "@/app/(app)/curve-lab/airframes/actions";
import { formValuesFor } from "@/lib/curve-lab/schema";
import { getAirframe } from "@/db/access/curve-lab/airframes";
import { defaultSpec, snapshotOf } from "@/lib/curve-lab/demo-spec";
import { seedStudentWeek } from "@/db/seed/student-week";
import { getSchool } from "@/db/access/shared/school";
import { seedContext, seedDay as day } from "../seed-helpers";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
afterAll(async () => {
  actAs(null);
  await closeDb();
});

test("the demo seed gives every enrolment a planned end, the school a knowledge test date, and the demo student a practice history", async () => {
  const s = await makeSchool("seedweek");
  actAs(s.as.instructor);
  const af = await createAirframeAction({
    ...formValuesFor(null, "metric"),
    name: "Seed trainer",
    emptyMass: 560,
    maxMass: 760,
    wingArea: 11.6,
    wingSpan: 9.8,
    oswaldEfficiency: 0.78,
    zeroLiftDragCoefficient: 0.032,
    cleanMaxLiftCoefficient: 1.45,
  });
  if (!af.ok) throw new Error(af.message);
  const d = await saveDemoAction({
    demoId: null,
    name: "Seeded",
    spec: defaultSpec(snapshotOf((await getAirframe(s.school.id, af.data.id))!)),
  });
  if (!d.ok) throw new Error(d.message);
  const student = s.people.students[0]!.id;
  await Assignment.create({
    schoolId: s.school.id,
    kind: "demo",
    briefingId: null,
    demoId: d.data.demoId,
    cohortId: null,
    studentId: student,
    dueOn: "2099-01-01",
    note: "",
    assignedBy: s.people.instructor.id,
  });
  await sequelize.transaction((t) =>
    seedStudentWeek(seedContext(s, t, { people: { rafael: s.people.chief.id }, students: { "student@chalkwing.test": student } })),
  );
  const ends = await sequelize.query<{ student_id: string; planned_end_on: string }>(
    `SELECT e.student_id, e.planned_end_on FROM enrolments e JOIN people p ON p.id = e.student_id WHERE p.school_id = :s`,
    { replacements: { s: s.school.id }, type: QueryTypes.SELECT },
  );
  expect(ends).toHaveLength(6);
  expect(ends.find((e) => e.student_id === student)!.planned_end_on).toBe(day(60));
  expect(ends.filter((e) => e.student_id !== student).every((e) => e.planned_end_on === "2027-02-28")).toBe(true); // 30 Aug 2026 + 182 days
  expect((await getSchool(s.school.id)).settings.knowledgeTestOn).toBe(day(45));
  const [p] = await sequelize.query<{ n: number; right: number }>(
    `SELECT count(*)::int AS n, count(*) FILTER (WHERE correct)::int AS right FROM practice_attempts WHERE student_id = :st`,
    { replacements: { st: student }, type: QueryTypes.SELECT },
  );
  // one question per kind this aircraft can be asked (it has a CLmax: all four), every third one wrong
  expect(p).toEqual({ n: 4, right: 3 });
});
