// The chief's Cohorts page: create, rename and close cohorts; add and move students with dated
// membership. A date that meets another membership is a 400 naming the field, never a 500, and
// nothing is written.
import { randomUUID } from "node:crypto";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { actAs, closeDb, makeSchool } from "@/tests/helpers/factories";
import { addMemberAction, closeCohortAction, createCohortAction, moveMemberAction, renameCohortAction } from "@/app/(app)/cohorts/actions";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
beforeAll(async () => {
  s = await makeSchool("cohorts");
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

const key = () => randomUUID();
const membershipsOf = async (studentId: string) =>
  sequelize.query<{ cohortId: string; fromDate: string; toDate: string | null }>(
    `SELECT cohort_id AS "cohortId", from_date::text AS "fromDate", to_date::text AS "toDate" FROM cohort_memberships WHERE student_id = :p ORDER BY from_date`,
    { replacements: { p: studentId }, type: QueryTypes.SELECT },
  );
async function newCohort(name: string, startsOn = "2026-09-01") {
  const r = await createCohortAction({
    name,
    courseId: s.course.id,
    leadInstructorId: s.people.instructor.id,
    startsOn,
    idempotencyKey: key(),
  });
  expect(r).toMatchObject({ ok: true });
  return (r as { data: { id: string; name: string } }).data;
}

describe("cohorts", () => {
  it("the chief creates a cohort (a retried submit creates it once) and renames it; a taken name is a 409 naming name", async () => {
    actAs(s.as.chief);
    const k = key();
    const input = { name: "  Osprey   cohort ", courseId: s.course.id, leadInstructorId: s.people.instructor.id, startsOn: "2026-10-01" };
    const first = await createCohortAction({ ...input, idempotencyKey: k });
    const again = await createCohortAction({ ...input, idempotencyKey: k });
    expect(first).toMatchObject({ ok: true, data: { name: "Osprey cohort" } });
    expect(again).toMatchObject({ ok: true, replayed: true });
    const [{ n }] = (await sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM cohorts WHERE school_id = :s AND name = 'Osprey cohort'`,
      {
        replacements: { s: s.school.id },
        type: QueryTypes.SELECT,
      },
    )) as [{ n: number }];
    expect(n).toBe(1);
    const id = (first as { data: { id: string } }).data.id;
    expect(await renameCohortAction({ cohortId: id, name: "Osprey (evening)" })).toMatchObject({
      ok: true,
      data: { name: "Osprey (evening)" },
    });
    expect(await renameCohortAction({ cohortId: id, name: s.cohorts.a.name })).toMatchObject({ ok: false, status: 409, field: "name" });
  });

  it.each([
    ["no name", { name: "  " }, "name"],
    ["a course of nowhere", { courseId: "00000000-0000-4000-8000-000000000000" }, "courseId"],
    ["a student as lead", { leadInstructorId: "STUDENT" }, "leadInstructorId"],
    ["February 30", { startsOn: "2026-02-30" }, "startsOn"],
  ])("creating a cohort with %s is a 400 naming the field", async (_label, over, field) => {
    actAs(s.as.chief);
    const given =
      (over as { leadInstructorId?: string }).leadInstructorId === "STUDENT" ? { leadInstructorId: s.people.students[0]!.id } : over;
    const res = await createCohortAction({
      name: `Bad ${field}`,
      courseId: s.course.id,
      leadInstructorId: s.people.instructor.id,
      startsOn: "2026-10-01",
      idempotencyKey: key(),
      ...given,
    });
    expect(res).toMatchObject({ ok: false, status: 400, field });
  });

  it("a cohort closes only once nobody belongs to it then (409 naming closedOn), and takes no one after", async () => {
    actAs(s.as.chief);
    const c = await newCohort("Short course");
    const st = s.people.students[2]!.id;
    expect(await moveMemberAction({ studentId: st, toCohortId: c.id, onDate: "2026-10-01", idempotencyKey: key() })).toMatchObject({
      ok: true,
    });
    expect(await closeCohortAction({ cohortId: c.id, closedOn: "2026-11-01" })).toMatchObject({
      ok: false,
      status: 409,
      field: "closedOn",
    });
    expect(
      await moveMemberAction({ studentId: st, toCohortId: s.cohorts.a.id, onDate: "2026-11-01", idempotencyKey: key() }),
    ).toMatchObject({ ok: true });
    expect(await closeCohortAction({ cohortId: c.id, closedOn: "2026-08-01" })).toMatchObject({
      ok: false,
      status: 400,
      field: "closedOn",
    });
    expect(await closeCohortAction({ cohortId: c.id, closedOn: "2026-11-01" })).toMatchObject({
      ok: true,
      data: { closedOn: "2026-11-01" },
    });
    expect(await moveMemberAction({ studentId: st, toCohortId: c.id, onDate: "2026-11-15", idempotencyKey: key() })).toMatchObject({
      ok: false,
      status: 409,
      field: "toCohortId",
    });
    expect(await membershipsOf(st)).toEqual([
      { cohortId: s.cohorts.a.id, fromDate: "2026-09-01", toDate: "2026-10-01" },
      { cohortId: c.id, fromDate: "2026-10-01", toDate: "2026-11-01" },
      { cohortId: s.cohorts.a.id, fromDate: "2026-11-01", toDate: null },
    ]);
  });
});

describe("dated membership", () => {
  it("a move ends the running membership on the date and starts the new one; history stays", async () => {
    actAs(s.as.chief);
    const st = s.people.students[1]!.id;
    expect(
      await moveMemberAction({ studentId: st, toCohortId: s.cohorts.b.id, onDate: "2026-10-15", idempotencyKey: key() }),
    ).toMatchObject({ ok: true });
    expect(await membershipsOf(st)).toEqual([
      { cohortId: s.cohorts.a.id, fromDate: "2026-09-01", toDate: "2026-10-15" },
      { cohortId: s.cohorts.b.id, fromDate: "2026-10-15", toDate: null },
    ]);
  });

  it("a move dated into a later membership overlaps it: a 400 naming onDate, never a 500, and nothing is written", async () => {
    actAs(s.as.chief);
    const st = s.people.students[3]!.id; // in B from 2026-09-01
    const c = await newCohort("Overlap cohort");
    // a later stay: B until 2026-12-01, then the overlap cohort
    expect(await moveMemberAction({ studentId: st, toCohortId: c.id, onDate: "2026-12-01", idempotencyKey: key() })).toMatchObject({
      ok: true,
    });
    const before = await membershipsOf(st);
    // moving to A from 2026-10-01 would run into the stay that begins 2026-12-01
    const res = await moveMemberAction({ studentId: st, toCohortId: s.cohorts.a.id, onDate: "2026-10-01", idempotencyKey: key() });
    expect(res).toMatchObject({
      ok: false,
      status: 400,
      field: "onDate",
      fieldErrors: { onDate: [expect.stringContaining("already belongs")] },
    });
    expect(await membershipsOf(st)).toEqual(before);
  });

  it("adding a student who already belongs to a cohort on that date is a 400 naming fromDate; a student without one is added", async () => {
    actAs(s.as.chief);
    const c = await newCohort("Add cohort");
    const member = s.people.students[4]!.id;
    expect(await addMemberAction({ cohortId: c.id, studentId: member, fromDate: "2026-10-01", idempotencyKey: key() })).toMatchObject({
      ok: false,
      status: 400,
      field: "fromDate",
    });
    const [p] = await sequelize.query<{ id: string }>(
      `INSERT INTO people (school_id, name, email, roles) VALUES (:s, 'New Student', :e, ARRAY['student']) RETURNING id`,
      { replacements: { s: s.school.id, e: `new.${s.tag}@chalkwing.test` }, type: QueryTypes.SELECT },
    );
    expect(await addMemberAction({ cohortId: c.id, studentId: p!.id, fromDate: "2026-10-01", idempotencyKey: key() })).toMatchObject({
      ok: true,
    });
    expect(await membershipsOf(p!.id)).toEqual([{ cohortId: c.id, fromDate: "2026-10-01", toDate: null }]);
    expect(await addMemberAction({ cohortId: c.id, studentId: p!.id, fromDate: "2026-13-01", idempotencyKey: key() })).toMatchObject({
      ok: false,
      status: 400,
      field: "fromDate",
    });
  });

  it("an instructor may not manage cohorts (403) and nothing is written", async () => {
    actAs(s.as.instructor);
    const st = s.people.students[5]!.id;
    const before = await membershipsOf(st);
    expect(
      await moveMemberAction({ studentId: st, toCohortId: s.cohorts.a.id, onDate: "2026-10-20", idempotencyKey: key() }),
    ).toMatchObject({
      ok: false,
      status: 403,
    });
    expect(
      await createCohortAction({ name: "Nope", courseId: s.course.id, leadInstructorId: s.people.instructor.id, startsOn: "2026-10-01" }),
    ).toMatchObject({
      ok: false,
      status: 403,
    });
    expect(await membershipsOf(st)).toEqual(before);
  });
});
