jest.setTimeout(120_000);
import { NextRequest } from "next/server";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { generateScale } from "@/db/seed/scale";
import { createCohort } from "@/db/access/cohorts/memberships";
import { visibleStudentIds } from "@/db/access/shared/student-scope";
import { studentChoices } from "@/db/access/directory/students";
import { cohortChoices } from "@/db/access/directory/cohorts";
import { peopleChoices } from "@/db/access/directory/people";
import { GET as studentsGET } from "@/app/api/directory/students/route";
import { GET as cohortsGET } from "@/app/api/directory/cohorts/route";
import { GET as peopleGET } from "@/app/api/directory/people/route";
import { GET as instructorsGET } from "@/app/api/directory/instructors/route";
import { GET as endorsementsGET } from "@/app/api/directory/endorsements/route";
import { PICKER_LIST_MAX, PICKER_QUERY_MAX, PICKER_RESULTS, type PickerAnswer } from "@/lib/directory/picker";
import type { CurrentUser } from "@/lib/auth/session";
import { makeSchool, actAs, closeDb } from "@/tests/helpers/factories";

// The search pickers' endpoints (GET /api/directory/*): who may ask, what they see (students only
// through the caller's student scope), the query string checked field by field, and at most 20
// names whatever the size of the school.

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;

const handlers = {
  students: studentsGET,
  cohorts: cohortsGET,
  people: peopleGET,
  instructors: instructorsGET,
  endorsements: endorsementsGET,
};

async function ask(
  who: CurrentUser | null,
  set: keyof typeof handlers,
  query: Record<string, string>,
): Promise<{ status: number; body: PickerAnswer & { error?: { message: string; field?: string } } }> {
  actAs(who);
  const url = `http://127.0.0.1/api/directory/${set}?${new URLSearchParams(query).toString()}`;
  const res = await handlers[set](new NextRequest(url), { params: Promise.resolve({}) });
  return { status: res.status, body: await res.json() };
}

/** The names in the database's own order (its collation decides, as ORDER BY name does). */
async function dbOrder(names: string[]): Promise<string[]> {
  const rows = await sequelize.query<{ n: string }>(`SELECT n FROM unnest(ARRAY[:names]::text[]) n ORDER BY n`, {
    replacements: { names },
    type: QueryTypes.SELECT,
  });
  return rows.map((r) => r.n);
}

beforeAll(async () => {
  s = await makeSchool("picker");
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

describe("small school: the forms keep their plain lists", () => {
  it("lists every choice while the set is at most PICKER_LIST_MAX", async () => {
    const students = await studentChoices(s.as.chief, "cohorts");
    expect(students).toEqual({ kind: "list", rows: expect.any(Array) });
    if (students.kind !== "list") throw new Error("expected a list");
    expect(students.rows.map((r) => r.id).sort()).toEqual(s.people.students.map((p) => p.id).sort());
    const cohorts = await cohortChoices(s.as.chief, "timetable");
    expect(cohorts.kind === "list" && cohorts.rows.map((r) => r.id).sort()).toEqual([s.cohorts.a.id, s.cohorts.b.id].sort());
  });
});

describe("GET /api/directory/students", () => {
  it("gives an instructor only the students they teach", async () => {
    const r = await ask(s.as.instructor, "students", { purpose: "schedule", q: "Student" });
    expect(r.status).toBe(200);
    // cohort A (students 1 to 3) is led by this instructor; cohort B is not
    expect(r.body.rows.map((x) => x.id).sort()).toEqual(
      s.people.students
        .slice(0, 3)
        .map((p) => p.id)
        .sort(),
    );
    const chief = await ask(s.as.chief, "students", { purpose: "schedule", q: "Student" });
    expect(chief.body.rows.map((x) => x.id).sort()).toEqual(s.people.students.map((p) => p.id).sort());
  });

  it("refuses students and sponsors (403) and the signed-out (401), and a purpose whose form the caller may not use (403)", async () => {
    for (const who of [s.as.student, s.as.sponsor]) {
      const r = await ask(who, "students", { purpose: "schedule" });
      expect(r.status).toBe(403);
      expect(JSON.stringify(r.body)).not.toContain(s.people.students[3]!.id);
    }
    expect((await ask(null, "students", { purpose: "schedule" })).status).toBe(401);
    // the Cohorts page and transfer credit are the chief's
    expect((await ask(s.as.instructor, "students", { purpose: "cohorts" })).status).toBe(403);
    expect((await ask(s.as.instructor, "students", { purpose: "transfers" })).status).toBe(403);
  });

  it("answers a bad query string with a 400 naming the field", async () => {
    const long = await ask(s.as.chief, "students", { purpose: "schedule", q: "x".repeat(PICKER_QUERY_MAX + 1) });
    expect(long.status).toBe(400);
    expect(long.body.error).toMatchObject({ field: "q" });
    const none = await ask(s.as.chief, "students", { q: "Student" });
    expect(none.status).toBe(400);
    expect(none.body.error).toMatchObject({ field: "purpose" });
    const bad = await ask(s.as.chief, "students", { purpose: "everyone" });
    expect(bad.status).toBe(400);
    expect(bad.body.error?.message).toMatch(/^purpose: must be one of schedule, /);
    const nul = await ask(s.as.chief, "students", { purpose: "schedule", q: "a\u0000b" });
    expect(nul.status).toBe(400);
    expect(nul.body.error).toMatchObject({ field: "q" });
  });

  it("purpose endorsements: students on a course in the caller's records scope, with their course", async () => {
    const r = await ask(s.as.instructor2, "students", { purpose: "endorsements", q: "Student" });
    expect(r.status).toBe(200);
    expect(r.body.rows.map((x) => x.id).sort()).toEqual(
      s.people.students
        .slice(3)
        .map((p) => p.id)
        .sort(),
    );
    expect(r.body.rows.every((x) => x.detail === s.course.code)).toBe(true);
  });

  it("purpose notes: students in the caller's records scope who have a sponsor", async () => {
    const r = await ask(s.as.chief, "students", { purpose: "notes", q: "Student" });
    expect(r.status).toBe(200);
    expect(r.body.rows.map((x) => x.id)).toEqual([s.people.students[0]!.id]);
    expect((await ask(s.as.instructor2, "students", { purpose: "notes", q: "Student" })).body.rows).toEqual([]);
  });

  it("purpose assignments: an instructor gets the cohorts they lead and those cohorts' students, each with their cohort", async () => {
    const cohorts = await ask(s.as.instructor, "cohorts", { purpose: "assignments" });
    expect(cohorts.status).toBe(200);
    expect(cohorts.body.rows.map((x) => x.id)).toEqual([s.cohorts.a.id]);
    const chief = await ask(s.as.chief, "cohorts", { purpose: "assignments" });
    expect(chief.body.rows.map((x) => x.id).sort()).toEqual([s.cohorts.a.id, s.cohorts.b.id].sort());
    const students = await ask(s.as.instructor, "students", { purpose: "assignments" });
    expect(students.body.rows.map((x) => x.id).sort()).toEqual(
      s.people.students
        .slice(0, 3)
        .map((p) => p.id)
        .sort(),
    );
    expect(students.body.rows.every((x) => x.detail === s.cohorts.a.name)).toBe(true);
    expect((await ask(s.as.student, "cohorts", { purpose: "assignments" })).status).toBe(403);
  });

  it("takes the search text literally (a % matches only a %)", async () => {
    const r = await ask(s.as.chief, "students", { purpose: "cohorts", q: "%" });
    expect(r.status).toBe(200);
    expect(r.body.rows).toEqual([]);
    const u = await ask(s.as.chief, "students", { purpose: "cohorts", q: "Student_" });
    expect(u.body.rows).toEqual([]);
  });
});

describe("GET /api/directory/instructors", () => {
  it("offers per form who may teach (timetable), sign (register) or lead a cohort (cohorts), never a student", async () => {
    const staff = [s.people.chief.id, s.people.instructor.id, s.people.instructor2.id].sort();
    const teach = await ask(s.as.instructor, "instructors", { purpose: "timetable" });
    expect(teach.status).toBe(200);
    expect(teach.body.rows.map((x) => x.id).sort()).toEqual(staff);
    // a cohort's lead: those who hold the instructor role (the chief here holds it too)
    const lead = await ask(s.as.chief, "instructors", { purpose: "cohorts", q: "Instructor T" });
    expect(lead.body.rows.map((x) => x.id)).toEqual([s.people.instructor2.id]);
    expect((await ask(s.as.chief, "instructors", { purpose: "register", q: "Student" })).body.rows).toEqual([]);
    // the register names past signers too (marked), the Timetable only active staff
    await sequelize.query(`UPDATE people SET active = false WHERE id = :id`, { replacements: { id: s.people.instructor2.id } });
    try {
      expect((await ask(s.as.chief, "instructors", { purpose: "register", q: "Instructor Two" })).body.rows).toEqual([
        { id: s.people.instructor2.id, name: "Instructor Two", detail: "deactivated", primary: "Instructor Two" },
      ]);
      expect((await ask(s.as.chief, "instructors", { purpose: "timetable", q: "Instructor Two" })).body.rows).toEqual([]);
    } finally {
      await sequelize.query(`UPDATE people SET active = true WHERE id = :id`, { replacements: { id: s.people.instructor2.id } });
    }
  });

  it("refuses students and sponsors (403), forms the caller may not use (403), and a bad query (400 naming the field)", async () => {
    for (const who of [s.as.student, s.as.sponsor]) expect((await ask(who, "instructors", { purpose: "timetable" })).status).toBe(403);
    expect((await ask(null, "instructors", { purpose: "timetable" })).status).toBe(401);
    expect((await ask(s.as.instructor, "instructors", { purpose: "register" })).status).toBe(403);
    expect((await ask(s.as.instructor, "instructors", { purpose: "cohorts" })).status).toBe(403);
    const bad = await ask(s.as.chief, "instructors", { purpose: "lead" });
    expect(bad.status).toBe(400);
    expect(bad.body.error).toMatchObject({ field: "purpose" });
    const long = await ask(s.as.chief, "instructors", { purpose: "timetable", q: "z".repeat(PICKER_QUERY_MAX + 1) });
    expect(long.body.error).toMatchObject({ field: "q" });
  });
});

describe("GET /api/directory/endorsements", () => {
  it("answers staff who record results (an empty school: no choices), refuses others, and names a bad field", async () => {
    for (const kind of ["awaiting", "remedial"]) {
      const r = await ask(s.as.instructor, "endorsements", { kind });
      expect(r.status).toBe(200);
      expect(r.body).toEqual({ rows: [], more: false });
    }
    for (const who of [s.as.student, s.as.sponsor]) expect((await ask(who, "endorsements", { kind: "awaiting" })).status).toBe(403);
    expect((await ask(null, "endorsements", { kind: "awaiting" })).status).toBe(401);
    const bad = await ask(s.as.chief, "endorsements", { kind: "results" });
    expect(bad.status).toBe(400);
    expect(bad.body.error).toMatchObject({ field: "kind" });
    const missing = await ask(s.as.chief, "endorsements", {});
    expect(missing.body.error).toMatchObject({ field: "kind" });
    const long = await ask(s.as.chief, "endorsements", { kind: "remedial", q: "z".repeat(PICKER_QUERY_MAX + 1) });
    expect(long.body.error).toMatchObject({ field: "q" });
  });
});

describe("with 60 more students and 60 more cohorts", () => {
  beforeAll(async () => {
    await generateScale(60, { schoolId: s.school.id });
    await sequelize.transaction(async (t) => {
      for (let i = 0; i < 60; i++)
        await createCohort(
          {
            schoolId: s.school.id,
            courseId: s.course.id,
            name: `Picker cohort ${String(i).padStart(2, "0")} ${s.tag}`,
            leadInstructorId: s.people.instructor.id,
            startsOn: "2026-10-01",
          },
          t,
        );
    });
  });

  it("the forms switch to the search picker above PICKER_LIST_MAX", async () => {
    expect(s.people.students.length + 60).toBeGreaterThan(PICKER_LIST_MAX);
    expect(await studentChoices(s.as.chief, "cohorts")).toEqual({ kind: "search" });
    expect(await cohortChoices(s.as.chief, "timetable")).toEqual({ kind: "search" });
    // the chief's account pickers: 69 accounts
    expect(await peopleChoices(s.as.chief, "any")).toEqual({ kind: "search" });
  });

  it("answers at most 20 students, ordered by name, and says more match", async () => {
    const r = await ask(s.as.chief, "students", { purpose: "cohorts" });
    expect(r.status).toBe(200);
    expect(r.body.rows).toHaveLength(PICKER_RESULTS);
    expect(r.body.more).toBe(true);
    const names = r.body.rows.map((x) => x.name);
    expect(names).toEqual(await dbOrder(names));
    // the first 20 of the school by name: nobody the answer skipped sorts before its last
    const [{ before }] = (await sequelize.query<{ before: number }>(
      `SELECT count(*)::int AS before FROM people WHERE school_id = :s AND active AND 'student' = ANY(roles) AND (name, id) <= (:name, CAST(:id AS uuid))`,
      { replacements: { s: s.school.id, name: names.at(-1), id: r.body.rows.at(-1)!.id }, type: QueryTypes.SELECT },
    )) as [{ before: number }];
    expect(before).toBe(PICKER_RESULTS);
  });

  it("keeps an instructor's search inside their scope at any size", async () => {
    const r = await ask(s.as.instructor2, "students", { purpose: "schedule" });
    expect(r.status).toBe(200);
    expect(r.body.rows.length).toBeLessThanOrEqual(PICKER_RESULTS);
    const visible = new Set(await visibleStudentIds(s.as.instructor2, "schedule"));
    expect(r.body.rows.length).toBeGreaterThan(0);
    for (const row of r.body.rows) expect(visible.has(row.id)).toBe(true);
    // the taught students of the other instructor stay out even when named
    const other = await ask(s.as.instructor2, "students", { purpose: "schedule", q: "Student 1" });
    expect(other.body.rows.map((x) => x.id)).not.toContain(s.people.students[0]!.id);
  });

  it("answers at most 20 cohorts and narrows them by name; placing leaves closed cohorts out", async () => {
    const r = await ask(s.as.instructor, "cohorts", { purpose: "timetable", q: "Picker cohort" });
    expect(r.status).toBe(200);
    expect(r.body.rows).toHaveLength(PICKER_RESULTS);
    expect(r.body.more).toBe(true);
    expect(r.body.rows[0]!.name).toBe(`Picker cohort 00 ${s.tag}`);
    const one = await ask(s.as.chief, "cohorts", { purpose: "placing", q: `cohort 42 ${s.tag}` });
    expect(one.body).toMatchObject({ rows: [{ name: `Picker cohort 42 ${s.tag}` }], more: false });
    await sequelize.query(`UPDATE cohorts SET closed_on = '2027-01-01' WHERE school_id = :s AND name = :n`, {
      replacements: { s: s.school.id, n: `Picker cohort 42 ${s.tag}` },
    });
    expect((await ask(s.as.chief, "cohorts", { purpose: "placing", q: `cohort 42 ${s.tag}` })).body.rows).toEqual([]);
    expect((await ask(s.as.chief, "cohorts", { purpose: "timetable", q: `cohort 42 ${s.tag}` })).body.rows).toHaveLength(1);
    expect((await ask(s.as.instructor, "cohorts", { purpose: "placing" })).status).toBe(403);
    expect((await ask(s.as.student, "cohorts", { purpose: "timetable" })).status).toBe(403);
    expect((await ask(s.as.chief, "cohorts", { purpose: "timetable", q: "y".repeat(PICKER_QUERY_MAX + 1) })).body.error).toMatchObject({
      field: "q",
    });
  });

  it("GET /api/directory/people: the chief's account pickers, 20 at most; sponsors only with role=sponsor", async () => {
    const all = await ask(s.as.chief, "people", {});
    expect(all.status).toBe(200);
    expect(all.body.rows).toHaveLength(PICKER_RESULTS);
    expect(all.body.more).toBe(true);
    const sponsors = await ask(s.as.chief, "people", { role: "sponsor" });
    expect(sponsors.body.rows.map((x) => x.id)).toEqual([s.people.sponsor.id]);
    const bad = await ask(s.as.chief, "people", { role: "pilot" });
    expect(bad.status).toBe(400);
    expect(bad.body.error).toMatchObject({ field: "role" });
    for (const who of [s.as.instructor, s.as.student, s.as.sponsor]) expect((await ask(who, "people", {})).status).toBe(403);
  });
});
