// The mail area's server actions and the set-password link, called in-process as each person.
import { randomUUID } from "node:crypto";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { enqueueMail } from "@/db/access/mail/outbox";
import { createSetPasswordLink, inspectSetPasswordToken } from "@/db/access/mail/set-password";
import { attemptSignIn } from "@/db/access/people/sign-in";
import { fixedClock, resetClock } from "@/lib/clock";
import { saveSchoolSettingsAction } from "@/app/(app)/settings/actions";
import { addSponsorNoteAction, retryMailAction } from "@/app/(app)/mail/actions";
import { setPasswordAction } from "@/app/(public)/set-password/[token]/actions";
import { actAs, closeDb, makeSchool } from "../../helpers/factories";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));

let s: Awaited<ReturnType<typeof makeSchool>>;
beforeAll(async () => {
  s = await makeSchool("mail-actions");
});
afterAll(async () => {
  actAs(null);
  resetClock();
  await closeDb();
});

const settings = {
  mailSenderName: "Larkhollow ground school",
  reminderLeadHours: 12,
  weeklyLetterDay: 3,
  checkValidityDays: 45,
  stageCheckPassMarkPercent: 75,
  lateEntryDays: 5,
  authority: "Test authority",
};

async function schoolSettings() {
  const [row] = await sequelize.query<{ settings: Record<string, unknown> }>(`SELECT settings FROM schools WHERE id = :id`, {
    replacements: { id: s.school.id },
    type: QueryTypes.SELECT,
  });
  return row!.settings;
}

describe("school settings", () => {
  test("the chief saves them; form strings are read as numbers", async () => {
    actAs(s.as.chief);
    const res = await saveSchoolSettingsAction({ ...settings, reminderLeadHours: "12", weeklyLetterDay: "3" });
    expect(res).toEqual({ ok: true, data: { saved: true } });
    expect(await schoolSettings()).toMatchObject(settings);
  });

  test.each([
    ["reminderLeadHours", 0, "at least 1 hour"],
    ["reminderLeadHours", 200, "at most 168 hours (7 days)"],
    ["weeklyLetterDay", 7, "choose a day"],
    ["mailSenderName", "Evil\r\nBcc: x@y.test", "must be on one line"],
    ["stageCheckPassMarkPercent", "abc", "must be a number"],
  ])("bad %s (%p) is refused naming the field, and nothing changes", async (field, value, message) => {
    actAs(s.as.chief);
    const before = await schoolSettings();
    const res = await saveSchoolSettingsAction({ ...settings, [field]: value });
    expect(res).toMatchObject({ ok: false, status: 400, fieldErrors: { [field]: [message] } });
    expect(await schoolSettings()).toEqual(before);
  });

  test("an instructor, a student and a sponsor are refused; signed out is 401", async () => {
    for (const who of [s.as.instructor, s.as.student, s.as.sponsor]) {
      actAs(who);
      expect(await saveSchoolSettingsAction(settings)).toMatchObject({ ok: false, status: 403 });
    }
    actAs(null);
    expect(await saveSchoolSettingsAction(settings)).toMatchObject({ ok: false, status: 401 });
  });
});

describe("notes for sponsors", () => {
  test("the cohort's lead instructor writes a note about a sponsored student; a retried submit stores it once", async () => {
    actAs(s.as.instructor);
    const key = `note-${randomUUID()}`;
    const body = `Good week ${randomUUID().slice(0, 6)}`;
    const first = await addSponsorNoteAction({ studentId: s.people.students[0]!.id, body, idempotencyKey: key });
    const again = await addSponsorNoteAction({ studentId: s.people.students[0]!.id, body, idempotencyKey: key });
    expect(first.ok && again.ok && again.data.id === first.data.id).toBe(true);
    const [n] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM sponsor_notes WHERE body = :b`, {
      replacements: { b: body },
      type: QueryTypes.SELECT,
    });
    expect(n!.n).toBe(1);
  });

  test("another cohort's instructor gets 404 and nothing is written; a student is refused", async () => {
    actAs(s.as.instructor2); // leads cohort B; students[0] is in cohort A
    const body = `Not mine ${randomUUID().slice(0, 6)}`;
    expect(await addSponsorNoteAction({ studentId: s.people.students[0]!.id, body })).toMatchObject({
      ok: false,
      status: 404,
      fieldErrors: { studentId: [expect.any(String)] },
    });
    actAs(s.as.student);
    expect(await addSponsorNoteAction({ studentId: s.people.students[0]!.id, body })).toMatchObject({ ok: false, status: 403 });
    const [n] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM sponsor_notes WHERE body = :b`, {
      replacements: { b: body },
      type: QueryTypes.SELECT,
    });
    expect(n!.n).toBe(0);
  });

  test("an empty note is refused naming the field", async () => {
    actAs(s.as.instructor);
    expect(await addSponsorNoteAction({ studentId: s.people.students[0]!.id, body: "   " })).toMatchObject({
      ok: false,
      status: 400,
      fieldErrors: { body: ["write the note"] },
    });
  });
});

describe("Send again", () => {
  async function failedMail(schoolId: string) {
    const key = `test.retry:${randomUUID()}`;
    await sequelize.transaction((t) =>
      enqueueMail(t, { schoolId, kind: "test", idempotencyKey: key, to: "x@chalkwing.test", subject: "s", text: "t", html: "<p>h</p>" }),
    );
    const [row] = await sequelize.query<{ id: string }>(
      `UPDATE outbox SET state = 'failed', attempts = 9, last_error = 'connect ECONNREFUSED' WHERE idempotency_key = :k RETURNING id`,
      {
        replacements: { k: key },
        type: QueryTypes.SELECT,
      },
    );
    return row!.id;
  }
  const stateOf = async (id: string) =>
    (
      await sequelize.query<{ state: string }>(`SELECT state FROM outbox WHERE id = :id`, { replacements: { id }, type: QueryTypes.SELECT })
    )[0]!.state;

  test("the chief puts a failed mail back in the queue; a second try is a 409", async () => {
    const id = await failedMail(s.school.id);
    actAs(s.as.chief);
    expect(await retryMailAction({ outboxId: id })).toEqual({ ok: true, data: { state: "queued" } });
    expect(await stateOf(id)).toBe("queued");
    expect(await retryMailAction({ outboxId: id })).toMatchObject({ ok: false, status: 409 });
  });

  test("another school's chief gets 404 and the mail stays failed", async () => {
    const other = await makeSchool("mail-actions-other");
    const id = await failedMail(other.school.id);
    actAs(s.as.chief);
    expect(await retryMailAction({ outboxId: id })).toMatchObject({ ok: false, status: 404 });
    expect(await stateOf(id)).toBe("failed");
    expect(await retryMailAction({ outboxId: "nope" })).toMatchObject({
      ok: false,
      status: 400,
      fieldErrors: { outboxId: ["not a mail id"] },
    });
  });
});

describe("set-password links", () => {
  async function invitee() {
    const email = `invitee.${randomUUID().slice(0, 8)}@chalkwing.test`;
    const [p] = await sequelize.query<{ id: string }>(
      `INSERT INTO people (school_id, name, email, roles) VALUES (:s, 'Invited Person', :e, ARRAY['student']) RETURNING id`,
      {
        replacements: { s: s.school.id, e: email },
        type: QueryTypes.SELECT,
      },
    );
    return { id: p!.id, email };
  }
  const tokenOf = (url: string) => url.split("/set-password/")[1]!;

  test("stores only the token's hash; opening the page changes nothing; the password is set once, then the link is refused", async () => {
    const p = await invitee();
    const link = await sequelize.transaction((t) => createSetPasswordLink(t, p.id));
    const token = tokenOf(link.url);
    const [stored] = await sequelize.query<{ token_hash: string }>(`SELECT token_hash FROM set_password_tokens WHERE person_id = :p`, {
      replacements: { p: p.id },
      type: QueryTypes.SELECT,
    });
    expect(stored!.token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(stored!.token_hash).not.toContain(token);

    expect(await inspectSetPasswordToken(token)).toEqual({ state: "valid", name: "Invited Person", email: p.email });
    expect(await inspectSetPasswordToken(token)).toMatchObject({ state: "valid" });

    expect(await setPasswordAction({ token, password: "short", confirm: "short" })).toMatchObject({
      ok: false,
      status: 400,
      fieldErrors: { password: ["Password must be at least 10 characters"] },
    });
    expect(await setPasswordAction({ token, password: "ä".repeat(37), confirm: "ä".repeat(37) })).toMatchObject({
      ok: false,
      fieldErrors: { password: ["Password must be at most 72 bytes"] },
    });
    expect(await setPasswordAction({ token, password: "a-good-password-1", confirm: "a-good-password-2" })).toMatchObject({
      ok: false,
      fieldErrors: { confirm: [expect.any(String)] },
    });
    expect(await setPasswordAction({ token, password: "a-good-password-1", confirm: "a-good-password-1" })).toEqual({
      ok: true,
      data: { done: true },
    });
    expect(await attemptSignIn(p.email, "a-good-password-1", "198.51.100.9")).toMatchObject({ id: p.id });

    expect(await setPasswordAction({ token, password: "another-password-9", confirm: "another-password-9" })).toMatchObject({
      ok: false,
      status: 400,
      fieldErrors: { token: ["This link has already been used."] },
    });
    expect(await inspectSetPasswordToken(token)).toEqual({ state: "used" });
    expect(await attemptSignIn(p.email, "another-password-9", "198.51.100.9")).toBeNull();
  });

  test("a link expires after 7 days", async () => {
    const p = await invitee();
    const clock = fixedClock(new Date("2026-12-01T10:00:00Z"));
    const link = await sequelize.transaction((t) => createSetPasswordLink(t, p.id));
    expect(link.expiresAt.toISOString()).toBe("2026-12-08T10:00:00.000Z");
    clock.set(new Date("2026-12-08T10:00:01Z"));
    expect(await inspectSetPasswordToken(tokenOf(link.url))).toEqual({ state: "expired" });
    expect(
      await setPasswordAction({ token: tokenOf(link.url), password: "a-good-password-1", confirm: "a-good-password-1" }),
    ).toMatchObject({ ok: false, fieldErrors: { token: [expect.stringContaining("expired")] } });
    resetClock();
  });

  test("an unknown or malformed token is refused", async () => {
    expect(await inspectSetPasswordToken("x".repeat(43))).toEqual({ state: "unknown" });
    expect(await inspectSetPasswordToken("../../etc")).toEqual({ state: "unknown" });
    expect(await setPasswordAction({ token: "x".repeat(43), password: "a-good-password-1", confirm: "a-good-password-1" })).toMatchObject({
      ok: false,
      status: 400,
    });
    expect(await setPasswordAction({})).toMatchObject({ ok: false, status: 400 });
  });
});
