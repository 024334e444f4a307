// The chief's people admin (issue 13): inviting staff and sponsors by e-mail (one account and one
// invitation in the outbox, even when the form is submitted twice), changing a person's roles
// (their sessions end at once), the school keeping its last chief instructor, and refusals.
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { actAs, closeDb, makeSchool } from "@/tests/helpers/factories";
import { currentSessionVersion } from "@/db/access/people/session-version";
import { changeRolesAction, invitePersonAction } from "@/app/(app)/people/accounts/actions";
import { auditCount } from "../records/helpers";

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
let other: School;
beforeAll(async () => {
  [s, other] = await Promise.all([makeSchool("admin"), makeSchool("admin-other")]);
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

const peopleWith = async (email: string) =>
  sequelize.query<{ id: string; roles: string[]; password_hash: string | null; school_id: string }>(
    `SELECT id, roles, password_hash, school_id FROM people WHERE lower(email) = lower(:email)`,
    { replacements: { email }, type: QueryTypes.SELECT },
  );
const invitationsTo = async (email: string) =>
  sequelize.query<{ recipient_id: string; subject: string; kind: string }>(
    `SELECT recipient_id, subject, kind FROM outbox WHERE lower(to_address) = lower(:email)`,
    { replacements: { email }, type: QueryTypes.SELECT },
  );
const rolesOf = async (id: string) => (await currentSessionVersion(id))!.roles;

describe("inviting a person", () => {
  it("creates one account and one invitation even when the same form is submitted twice at once", async () => {
    actAs(s.as.chief);
    const email = `tamsin.okoro.${s.tag}@chalkwing.test`;
    const input = { name: "Tamsin Okoro", email, roles: ["instructor"], idempotencyKey: `invite-${s.tag}` };
    const [a, b] = await Promise.all([invitePersonAction(input), invitePersonAction(input)]);
    expect(a).toMatchObject({ ok: true, data: { name: "Tamsin Okoro", email, roles: ["instructor"] } });
    expect(b).toMatchObject({ ok: true, data: a.ok ? a.data : {} });
    expect([a, b].filter((r) => r.ok && r.replayed)).toHaveLength(1);
    const people = await peopleWith(email);
    expect(people).toHaveLength(1);
    expect(people[0]).toMatchObject({ roles: ["instructor"], password_hash: null, school_id: s.school.id });
    const mails = await invitationsTo(email);
    expect(mails).toEqual([{ recipient_id: people[0]!.id, kind: "invitation", subject: expect.stringContaining(s.school.name) }]);
    expect(await auditCount(s.school.id, "person.invited", people[0]!.id)).toBe(1);
  });

  it("refuses the same e-mail from a fresh form (409 naming email): still one account and one mail", async () => {
    actAs(s.as.chief);
    const email = `tamsin.okoro.${s.tag}@chalkwing.test`;
    const r = await invitePersonAction({
      name: "Tamsin again",
      email: email.toUpperCase(),
      roles: ["sponsor"],
      idempotencyKey: `invite2-${s.tag}`,
    });
    expect(r).toMatchObject({ ok: false, status: 409, field: "email" });
    expect(await peopleWith(email)).toHaveLength(1);
    expect(await invitationsTo(email)).toHaveLength(1);
  });

  it("invites a sponsor and a chief instructor with the roles chosen", async () => {
    actAs(s.as.chief);
    for (const [label, roles] of [
      ["family.sponsor", ["sponsor"]],
      ["deputy.chief", ["chief", "instructor"]],
    ] as const) {
      const email = `${label}.${s.tag}@chalkwing.test`;
      const r = await invitePersonAction({
        name: `New ${label}`,
        email,
        roles,
        idempotencyKey: `invite-${label.replace(/\W/g, "-")}-${s.tag}`,
      });
      expect(r).toMatchObject({ ok: true, data: { roles } });
      expect(await invitationsTo(email)).toHaveLength(1);
    }
  });

  it("refuses bad input naming the field, and the student role (students join on the Roster); nothing is written", async () => {
    actAs(s.as.chief);
    const email = `nobody.${s.tag}@chalkwing.test`;
    const cases: [Record<string, unknown>, string][] = [
      [{ name: "", email, roles: ["instructor"] }, "name"],
      [{ name: "Nobody", email: "not-an-address", roles: ["instructor"] }, "email"],
      [{ name: "Nobody", email, roles: [] }, "roles"],
      [{ name: "Nobody", email }, "roles"],
      [{ name: "Nobody", email, roles: ["student"] }, "roles"],
      [{ name: "Nobody", email, roles: ["pilot"] }, "roles"],
    ];
    for (const [input, field] of cases) expect(await invitePersonAction(input)).toMatchObject({ ok: false, status: 400, field });
    expect(await peopleWith(email)).toHaveLength(0);
    expect(await invitationsTo(email)).toHaveLength(0);
  });

  it("refuses callers who may not manage accounts (403); nothing is written", async () => {
    const email = `refused.${s.tag}@chalkwing.test`;
    for (const who of [s.as.instructor, s.as.student, s.as.sponsor]) {
      actAs(who);
      expect(
        await invitePersonAction({ name: "Refused", email, roles: ["instructor"], idempotencyKey: `refused-${who.id}` }),
      ).toMatchObject({
        ok: false,
        status: 403,
      });
    }
    expect(await peopleWith(email)).toHaveLength(0);
    expect(await invitationsTo(email)).toHaveLength(0);
  });
});

describe("changing a person's roles", () => {
  it("changes the roles and ends the person's sessions at once (the session version moves on), audited", async () => {
    actAs(s.as.chief);
    const person = s.people.instructor2.id;
    const before = await currentSessionVersion(person);
    const r = await changeRolesAction({ personId: person, roles: ["instructor", "sponsor"] });
    expect(r).toMatchObject({ ok: true, data: { personId: person, roles: ["instructor", "sponsor"], sessionsEnded: true } });
    expect(await currentSessionVersion(person)).toMatchObject({
      roles: ["instructor", "sponsor"],
      sessionVersion: before!.sessionVersion + 1,
    });
    expect(await auditCount(s.school.id, "person.roles_changed", person)).toBe(1);
    // the same roles again: nothing to change, the sessions go on
    expect(await changeRolesAction({ personId: person, roles: ["sponsor", "instructor"] })).toMatchObject({
      ok: true,
      data: { sessionsEnded: false },
    });
    expect((await currentSessionVersion(person))!.sessionVersion).toBe(before!.sessionVersion + 1);
  });

  it("refuses the chief's removal of their own last chief role, with a message; nothing changes", async () => {
    const school = await makeSchool("admin-lastchief");
    actAs(school.as.chief);
    const before = await currentSessionVersion(school.people.chief.id);
    const r = await changeRolesAction({ personId: school.people.chief.id, roles: ["instructor"] });
    expect(r).toMatchObject({ ok: false, status: 409, field: "roles" });
    expect(!r.ok && r.message).toMatch(/last chief instructor/);
    expect(await currentSessionVersion(school.people.chief.id)).toEqual(before);
    // once another person is chief instructor, the first may step down
    expect(await changeRolesAction({ personId: school.people.instructor.id, roles: ["chief", "instructor"] })).toMatchObject({ ok: true });
    expect(await changeRolesAction({ personId: school.people.chief.id, roles: ["instructor"] })).toMatchObject({ ok: true });
    expect(await rolesOf(school.people.chief.id)).toEqual(["instructor"]);
  });

  it("does not count a deactivated chief instructor as the one the school keeps", async () => {
    const school = await makeSchool("admin-inactive");
    actAs(school.as.chief);
    await changeRolesAction({ personId: school.people.instructor2.id, roles: ["chief"] });
    await sequelize.query(`UPDATE people SET active = false WHERE id = :id`, { replacements: { id: school.people.instructor2.id } });
    expect(await changeRolesAction({ personId: school.people.chief.id, roles: ["instructor"] })).toMatchObject({
      ok: false,
      status: 409,
      field: "roles",
    });
  });

  it("refuses a student's account, bad input, another school's person, and callers who may not manage accounts", async () => {
    actAs(s.as.chief);
    const student = s.people.students[0]!.id;
    const studentBefore = await currentSessionVersion(student);
    expect(await changeRolesAction({ personId: student, roles: ["instructor"] })).toMatchObject({ ok: false, status: 409, field: "roles" });
    expect(await currentSessionVersion(student)).toEqual(studentBefore);
    expect(await changeRolesAction({ personId: s.people.instructor.id, roles: [] })).toMatchObject({
      ok: false,
      status: 400,
      field: "roles",
    });
    expect(await changeRolesAction({ personId: "nobody", roles: ["instructor"] })).toMatchObject({
      ok: false,
      status: 400,
      field: "personId",
    });
    const theirs = await currentSessionVersion(other.people.instructor.id);
    expect(await changeRolesAction({ personId: other.people.instructor.id, roles: ["sponsor"] })).toMatchObject({
      ok: false,
      status: 404,
      field: "personId",
    });
    expect(await currentSessionVersion(other.people.instructor.id)).toEqual(theirs);
    const mine = await currentSessionVersion(s.people.instructor.id);
    for (const who of [s.as.instructor, s.as.student, s.as.sponsor]) {
      actAs(who);
      expect(await changeRolesAction({ personId: s.people.instructor.id, roles: ["chief"] })).toMatchObject({ ok: false, status: 403 });
    }
    expect(await currentSessionVersion(s.people.instructor.id)).toEqual(mine);
  });
});
