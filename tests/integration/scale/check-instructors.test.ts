jest.setTimeout(120_000);
import { NextRequest } from "next/server";
import { sequelize } from "@/db/index";
import { createPerson, addQualification } from "@/db/access/people/create-person";
import { checkInstructorsOverview, designateCheckInstructor, DESIGNATED_SHOWN_MAX } from "@/db/access/records/stage-checks";
import { GET as instructorsGET } from "@/app/api/directory/instructors/route";
import { DESIGNATED_DETAIL, PICKER_LIST_MAX, type PickerAnswer } from "@/lib/directory/picker";
import type { CurrentUser } from "@/lib/auth/session";
import { makeSchool, actAs, closeDb } from "@/tests/helpers/factories";
import { countQueriesOf } from "@/tests/helpers/query-count";

// Records' Check instructors listed every instructor of the school with a toggle. Now it names the
// designated ones (the first DESIGNATED_SHOWN_MAX by name, with the count of all) and the others while
// they fit a list (PICKER_LIST_MAX); past that the chief finds any instructor by name through
// GET /api/directory/instructors?purpose=designate, which marks the designated ones. Two queries
// whatever the size of the staff. Only active instructors with a qualification in force can be designated.

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;

async function ask(who: CurrentUser | null, query: Record<string, string>) {
  actAs(who);
  const url = `http://127.0.0.1/api/directory/instructors?${new URLSearchParams(query).toString()}`;
  const res = await instructorsGET(new NextRequest(url), { params: Promise.resolve({}) });
  return { status: res.status, body: (await res.json()) as PickerAnswer & { error?: { field?: string } } };
}

/** `n` instructors named "Staff NNN <tag>", each with a ground instructor qualification in force. */
async function addInstructors(n: number, tag: string): Promise<string[]> {
  const ids: string[] = [];
  await sequelize.transaction(async (t) => {
    for (let i = 0; i < n; i++) {
      const p = await createPerson(
        {
          schoolId: s.school.id,
          name: `Staff ${String(i).padStart(3, "0")} ${tag}`,
          email: `staff${i}.${tag}.${s.tag}@chalkwing.test`,
          roles: ["instructor"],
        },
        t,
      );
      await addQualification(
        {
          personId: p.id,
          certificateKind: "Ground instructor",
          certificateNumber: `GI-${tag}-${i}`,
          ratings: [],
          issuedOn: "2020-01-01",
          recencyOn: "2026-01-01",
          courseIds: [s.course.id],
        },
        t,
      );
      ids.push(p.id);
    }
  });
  return ids;
}

beforeAll(async () => {
  s = await makeSchool("checkers");
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

describe("a small staff", () => {
  it("names the designated and lists the others, leaving out instructors with no qualification in force", async () => {
    // an instructor account with no qualification recorded yet cannot be designated
    await createPerson({
      schoolId: s.school.id,
      name: "Unqualified Newcomer",
      email: `newcomer.${s.tag}@chalkwing.test`,
      roles: ["instructor"],
    });
    const o = await checkInstructorsOverview(s.school.id);
    expect(o.designated).toEqual([{ id: s.people.chief.id, name: "Chief" }]);
    expect(o.designatedTotal).toBe(1);
    expect(o.others).toEqual({
      kind: "list",
      rows: [
        { id: s.people.instructor.id, name: "Instructor One" },
        { id: s.people.instructor2.id, name: "Instructor Two" },
      ],
    });
  });

  it("the picker (purpose designate) marks the designated, and only the chief may use it", async () => {
    const r = await ask(s.as.chief, { purpose: "designate" });
    expect(r.status).toBe(200);
    expect(r.body.rows.map((x) => [x.name, x.detail ?? null])).toEqual([
      ["Chief", DESIGNATED_DETAIL],
      ["Instructor One", null],
      ["Instructor Two", null],
    ]);
    // designating instructors is the chief's (stagechecks.designate)
    expect((await ask(s.as.instructor, { purpose: "designate" })).status).toBe(403);
    expect((await ask(s.as.student, { purpose: "designate" })).status).toBe(403);
    expect((await ask(null, { purpose: "designate" })).status).toBe(401);
  });
});

describe("a staff larger than a list", () => {
  let added: string[] = [];
  let before = 0;
  beforeAll(async () => {
    before = (await countQueriesOf(() => checkInstructorsOverview(s.school.id))).queries;
    added = await addInstructors(PICKER_LIST_MAX + 10, "big");
  });

  it("asks for a name instead of listing the others, in the same number of queries", async () => {
    const { queries, value } = await countQueriesOf(() => checkInstructorsOverview(s.school.id));
    expect(queries).toBe(before);
    expect(value.others).toEqual({ kind: "search" });
    const found = await ask(s.as.chief, { purpose: "designate", q: "Staff 042 big" });
    expect(found.body.rows).toEqual([{ id: added[42], name: "Staff 042 big", primary: "Staff 042 big" }]);
  });

  it("names the first designated by name and counts them all", async () => {
    await sequelize.transaction(async (t) => {
      for (const id of added.slice(0, DESIGNATED_SHOWN_MAX + 5))
        await designateCheckInstructor(t, s.as.chief, { personId: id, checkInstructor: true });
    });
    const { queries, value } = await countQueriesOf(() => checkInstructorsOverview(s.school.id));
    expect(queries).toBe(before);
    expect(value.designatedTotal).toBe(DESIGNATED_SHOWN_MAX + 6); // with the chief
    expect(value.designated).toHaveLength(DESIGNATED_SHOWN_MAX);
    expect(value.designated[0]).toEqual({ id: s.people.chief.id, name: "Chief" });
    expect(value.designated.slice(1).map((d) => d.name)).toEqual(
      Array.from({ length: DESIGNATED_SHOWN_MAX - 1 }, (_, i) => `Staff ${String(i).padStart(3, "0")} big`),
    );
    // the picker tells the chief who is designated already
    const found = await ask(s.as.chief, { purpose: "designate", q: "Staff 054 big" });
    expect(found.body.rows[0]?.detail).toBe(DESIGNATED_DETAIL);
    const notYet = await ask(s.as.chief, { purpose: "designate", q: "Staff 055 big" });
    expect(notYet.body.rows[0]?.detail).toBeUndefined();
  });
});
