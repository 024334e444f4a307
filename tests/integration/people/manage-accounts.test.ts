// The chief's account changes (people.manage): deactivation ends the person's sessions at once
// (the session version the token carries no longer matches), and sponsors are linked to students.
import { randomUUID } from "node:crypto";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { actAs, closeDb, makeSchool } from "@/tests/helpers/factories";
import { currentSessionVersion } from "@/db/access/people/session-version";
import { setAccountActiveAction, linkSponsorAction } from "@/app/(app)/people/actions";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
let other: School;
beforeAll(async () => {
  [s, other] = await Promise.all([makeSchool("accounts"), makeSchool("accounts-other")]);
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

const linksOf = async (sponsorId: string) =>
  (
    await sequelize.query<{ studentId: string }>(
      `SELECT student_id AS "studentId" FROM sponsor_links WHERE sponsor_id = :p ORDER BY student_id`,
      {
        replacements: { p: sponsorId },
        type: QueryTypes.SELECT,
      },
    )
  ).map((r) => r.studentId);

describe("deactivating an account", () => {
  it("ends the person's sessions at once (the session version moves on) and marks the account inactive; reactivating brings it back", async () => {
    actAs(s.as.chief);
    const person = s.people.instructor2.id;
    const before = await currentSessionVersion(person);
    expect(await setAccountActiveAction({ personId: person, active: false })).toMatchObject({ ok: true, data: { active: false } });
    const after = await currentSessionVersion(person);
    expect(after).toMatchObject({ active: false, sessionVersion: before!.sessionVersion + 1 });
    expect(await setAccountActiveAction({ personId: person, active: true })).toMatchObject({ ok: true, data: { active: true } });
    expect(await currentSessionVersion(person)).toMatchObject({ active: true, sessionVersion: before!.sessionVersion + 2 });
  });

  it("refuses the chief's own account (409), another school's person (404) and bad input (400 naming the field); nothing changes", async () => {
    actAs(s.as.chief);
    const mine = await currentSessionVersion(s.people.chief.id);
    expect(await setAccountActiveAction({ personId: s.people.chief.id, active: false })).toMatchObject({
      ok: false,
      status: 409,
      field: "personId",
    });
    expect(await currentSessionVersion(s.people.chief.id)).toEqual(mine);
    const theirs = await currentSessionVersion(other.people.instructor.id);
    expect(await setAccountActiveAction({ personId: other.people.instructor.id, active: false })).toMatchObject({
      ok: false,
      status: 404,
      field: "personId",
    });
    expect(await currentSessionVersion(other.people.instructor.id)).toEqual(theirs);
    expect(await setAccountActiveAction({ personId: "someone", active: false })).toMatchObject({
      ok: false,
      status: 400,
      field: "personId",
    });
    expect(await setAccountActiveAction({ personId: s.people.instructor.id, active: "off" })).toMatchObject({
      ok: false,
      status: 400,
      field: "active",
    });
  });

  it("an instructor may not deactivate anyone (403)", async () => {
    actAs(s.as.instructor);
    const before = await currentSessionVersion(s.people.instructor2.id);
    expect(await setAccountActiveAction({ personId: s.people.instructor2.id, active: false })).toMatchObject({ ok: false, status: 403 });
    expect(await currentSessionVersion(s.people.instructor2.id)).toEqual(before);
  });
});

describe("linking a sponsor to a student", () => {
  it("links once (a retry with the same key replays; a second link is a 409 naming studentId)", async () => {
    actAs(s.as.chief);
    const student = s.people.students[2]!.id;
    const k = randomUUID();
    expect(
      await linkSponsorAction({ sponsorId: s.people.sponsor.id, studentId: student, relationship: "parent", idempotencyKey: k }),
    ).toMatchObject({
      ok: true,
    });
    expect(
      await linkSponsorAction({ sponsorId: s.people.sponsor.id, studentId: student, relationship: "parent", idempotencyKey: k }),
    ).toMatchObject({
      ok: true,
      replayed: true,
    });
    expect(await linksOf(s.people.sponsor.id)).toEqual([s.people.students[0]!.id, student].sort());
    expect(await linkSponsorAction({ sponsorId: s.people.sponsor.id, studentId: student, idempotencyKey: randomUUID() })).toMatchObject({
      ok: false,
      status: 409,
      field: "studentId",
    });
  });

  it.each([
    ["a student as the sponsor", () => ({ sponsorId: s.people.students[1]!.id, studentId: s.people.students[2]!.id }), "sponsorId"],
    ["an instructor as the student", () => ({ sponsorId: s.people.sponsor.id, studentId: s.people.instructor.id }), "studentId"],
    ["another school's student", () => ({ sponsorId: s.people.sponsor.id, studentId: other.people.students[0]!.id }), "studentId"],
    [
      "a relationship of 61 characters",
      () => ({ sponsorId: s.people.sponsor.id, studentId: s.people.students[4]!.id, relationship: "r".repeat(61) }),
      "relationship",
    ],
  ])("%s is a 400 naming the field; no link is made", async (_label, make, field) => {
    actAs(s.as.chief);
    const before = await linksOf(s.people.sponsor.id);
    expect(await linkSponsorAction({ ...make(), idempotencyKey: randomUUID() })).toMatchObject({ ok: false, status: 400, field });
    expect(await linksOf(s.people.sponsor.id)).toEqual(before);
  });
});
