jest.setTimeout(120_000);
import { sequelize } from "@/db/index";
import { generateScale } from "@/db/seed/scale";
import { createCohort } from "@/db/access/cohorts/memberships";
import { searchStudents, studentChoices } from "@/db/access/directory/students";
import { searchCohorts, cohortChoices } from "@/db/access/directory/cohorts";
import { searchPeople, peopleChoices } from "@/db/access/directory/people";
import { searchInstructors, instructorChoices } from "@/db/access/directory/instructors";
import { timetableFilterChoices } from "@/db/access/timetable/filter-choices";
import { schedulingChoices } from "@/db/access/timetable/scheduling-choices";
import { transferChoices } from "@/db/access/transfers/students";
import { PICKER_LIST_MAX, PICKER_RESULTS, type PickerChoices } from "@/lib/directory/picker";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { countQueriesOf } from "@/tests/helpers/query-count";

// The pickers' data does not grow with the school: every form's choices and every search answer
// take no more SQL queries at 80 students than at 20 generated students (after 60 more students and 60
// more cohorts), and none carries more than PICKER_LIST_MAX choices (a search, PICKER_RESULTS).

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;

beforeAll(async () => {
  s = await makeSchool("scale-pick");
  await generateScale(20, { schoolId: s.school.id });
});
afterAll(async () => {
  jest.restoreAllMocks();
  await closeDb();
});

/** The most names one picker in a value carries to the page (choices listed, search rows, transfer students). */
function carried(value: unknown): number {
  if (Array.isArray(value)) return Math.max(0, ...value.map(carried));
  const v = value as Partial<PickerChoices> & { rows?: unknown[]; students?: unknown[]; cohorts?: unknown };
  if (v.kind === "search" && !v.students) return 0;
  if (v.rows) return v.rows.length;
  if (v.students) return v.students.length;
  return 0;
}

const READS: Record<string, () => Promise<unknown>> = {
  "student search (chief, instructor)": () =>
    Promise.all([searchStudents(s.as.chief, "cohorts", ""), searchStudents(s.as.instructor, "schedule", "a")]),
  "cohort search": () => searchCohorts(s.as.chief, "timetable", ""),
  "account search": () => Promise.all([searchPeople(s.as.chief, "any", ""), searchPeople(s.as.chief, "sponsor", "")]),
  "instructor search and choices": () =>
    Promise.all([
      searchInstructors(s.as.chief, "timetable", ""),
      instructorChoices(s.as.chief, "register"),
      instructorChoices(s.as.chief, "cohorts"),
    ]),
  "Cohorts page's Add or move choices": () => Promise.all([studentChoices(s.as.chief, "cohorts"), cohortChoices(s.as.chief, "placing")]),
  "People's account choices": () =>
    Promise.all([peopleChoices(s.as.chief, "any"), peopleChoices(s.as.chief, "sponsor"), studentChoices(s.as.chief, "sponsors")]),
  "Timetable filters": async () => {
    const c = await timetableFilterChoices(s.as.chief);
    return [c.cohorts, c.instructors];
  },
  "scheduling form": async () => {
    const c = await schedulingChoices(s.as.instructor);
    return [c.cohorts, c.students, c.instructors];
  },
  "transfer credit form": () => transferChoices(s.as.chief),
};

async function measure(): Promise<Record<string, { queries: number; carried: number }>> {
  const out: Record<string, { queries: number; carried: number }> = {};
  for (const [name, work] of Object.entries(READS)) {
    await work(); // warm
    const r = await countQueriesOf(work);
    out[name] = { queries: r.queries, carried: carried(r.value) };
  }
  return out;
}

it("reads no more queries and carries a bounded number of names at 20 and at 80 students", async () => {
  const small = await measure();
  await generateScale(60, { schoolId: s.school.id });
  await sequelize.transaction(async (t) => {
    for (let i = 0; i < 60; i++)
      await createCohort(
        {
          schoolId: s.school.id,
          courseId: s.course.id,
          name: `Scale pick ${i} ${s.tag}`,
          leadInstructorId: s.people.instructor2.id,
          startsOn: "2026-10-01",
        },
        t,
      );
  });
  const large = await measure();
  for (const name of Object.keys(READS)) {
    // no more queries than at 20 (a form that switched to searching may read fewer)
    expect({ name, grew: large[name]!.queries > small[name]!.queries }).toEqual({ name, grew: false });
    expect({ name, carried: large[name]!.carried <= PICKER_LIST_MAX }).toEqual({ name, carried: true });
  }
  // at 86 students and 63 cohorts every form searches instead of listing
  expect(await studentChoices(s.as.chief, "cohorts")).toEqual({ kind: "search" });
  expect(await cohortChoices(s.as.chief, "timetable")).toEqual({ kind: "search" });
  expect(large["Cohorts page's Add or move choices"]!.carried).toBe(0);
  expect(large["transfer credit form"]!.carried).toBe(0);
  expect(large["cohort search"]!.carried).toBe(PICKER_RESULTS);
  expect(large["student search (chief, instructor)"]!.carried).toBe(PICKER_RESULTS);
  // transfer credit beyond the list: the page reads the student chosen in the picker, alone, with their items
  const chosen = await transferChoices(s.as.chief, { studentId: s.people.students[0]!.id });
  expect(chosen.kind).toBe("search");
  expect(chosen.students.map((x) => x.id)).toEqual([s.people.students[0]!.id]);
  expect(chosen.items[chosen.students[0]!.revisionId]!.length).toBeGreaterThan(0);
  expect((await transferChoices(s.as.chief, { studentId: "not-a-uuid" })).students).toEqual([]);
  // while small, the forms list every choice (no change for a small school)
  expect(small["Cohorts page's Add or move choices"]!.carried).toBeGreaterThan(20);
});
