// Consent and sponsors, and the Weekly letter: a student's choices reach the sponsor's pages and
// the next letter at once (canary strings), are audited, and a minor's links are the school's;
// the chief previews and sends a letter now (one per double click); a sponsor reads the letters
// sent to them and turns a stopped letter back on; a letter covers every day, weekends included.
import { randomUUID } from "node:crypto";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { sponsorOverview } from "@/db/access/sponsoring/overview";
import { lettersSentTo, letterSentTo } from "@/db/access/sponsoring/letters";
import { letterLink } from "@/db/access/mail/letter-links";
import { weeklyLetterRecipients } from "@/db/access/mail/weekly-letter-recipients";
import { weeklyLetterData } from "@/db/access/mail/weekly-letter-data";
import { progressFor } from "@/db/access/records/progress-map";
import { getSchool } from "@/db/access/shared/school";
import { composeLetterFor } from "@/lib/mail/producers";
import { changeSharingAction, changeStudentSharingAction } from "@/app/(app)/sharing/actions";
import { resumeLetterAction } from "@/app/(app)/letters/actions";
import { sendLetterNowAction } from "@/app/(app)/mail/actions";
import { linkSponsor } from "@/db/access/cohorts/sponsor-links";
import { createSyllabusRevision } from "@/db/access/syllabus/create-revision";
import { moveEnrolmentToRevision } from "@/db/access/syllabus/enrolments";
import { DEMO_STAGES } from "@/db/seed/scenario";
import { actAs, closeDb, makeSchool } from "../../helpers/factories";
import { check, itemId, sign, auditCount } from "../records/helpers";
import { makeBriefing, makeSession } from "./helpers";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
jest.setTimeout(60_000);

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
const canaryM = `MILESTONE${randomUUID().slice(0, 6).toUpperCase()}`;
const canaryO = `OUTCOME${randomUUID().slice(0, 6).toUpperCase()}`;
const all = { attendance: true, hours: true, milestones: true, outcomes: true, schedule: true, weeklyLetter: true };

beforeAll(async () => {
  s = await makeSchool("consent");
  const student = s.people.students[0]!.id;
  // a revision whose first two items carry the canaries in their titles; the student moves onto it
  const stages = DEMO_STAGES.map((st) => ({
    ...st,
    items: st.items.map((i) => (i.code === "AER-01" ? { ...i, title: canaryM } : i.code === "AER-02" ? { ...i, title: canaryO } : i)),
  }));
  const rev = await sequelize.transaction((t) =>
    createSyllabusRevision(
      { courseId: s.course.id, approvedOn: "2026-01-02", effectiveFrom: "2026-01-02", changeNote: "canaries", stages },
      t,
    ),
  );
  const [enr] = await sequelize.query<{ id: string }>(`SELECT id FROM enrolments WHERE student_id = :st AND status = 'active'`, {
    replacements: { st: student },
    type: QueryTypes.SELECT,
  });
  await sequelize.transaction((t) => moveEnrolmentToRevision(s.school.id, enr!.id, rev.id, t));
  s = { ...s, revision: { ...s.revision, id: rev.id } };
  const a1 = await itemId(s, "AER-01");
  const a2 = await itemId(s, "AER-02");
  await check(s.as.instructor, student, [a1], { occurredAt: new Date(Date.now() - 3600_000) });
  await sign(s.as.instructor, { studentId: student, itemId: a1 });
  await check(s.as.instructor, student, [a2], { question: { outcome: "shaky" } });
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

async function letterText(sponsorId = s.people.sponsor.id, studentId = s.people.students[0]!.id) {
  const school = await getSchool(s.school.id);
  const link = await letterLink(s.school.id, sponsorId, studentId);
  const { mail } = await composeLetterFor(link, school, new Date());
  return `${mail.subject}\n${mail.text}\n${mail.html}`;
}
async function sponsorPage() {
  return JSON.stringify(await sponsorOverview(s.as.sponsor));
}

describe("consent: what a sponsor sees, changed by the adult student", () => {
  test("before: both canaries on the sponsor's Today and in the letter, with titles beside the codes", async () => {
    const letter = await letterText();
    expect(letter).toContain(`AER-01 ${canaryM}`);
    expect(letter).toContain(`AER-02 ${canaryO}`);
    const page = await sponsorPage();
    expect(page).toContain(canaryM);
    expect(page).toContain(canaryO);
    const [o] = await sponsorOverview(s.as.sponsor);
    expect(o!.milestones).toMatchObject({ signed: 1, latest: { code: "AER-01", title: canaryM } });
    expect(o!.letter).toBe("on");
  });

  test("withdrawing check results removes that canary at once; milestones stay; audited with who", async () => {
    actAs(s.as.student);
    const res = await changeSharingAction({ studentId: s.people.students[0]!.id, sponsorId: s.people.sponsor.id, ...all, outcomes: false });
    expect(res).toMatchObject({ ok: true, data: { changed: true } });
    const letter = await letterText();
    expect(letter).not.toContain(canaryO);
    expect(letter).not.toContain("Check results");
    expect(letter).toContain(canaryM);
    const page = await sponsorPage();
    expect(page).not.toContain(canaryO);
    expect(page).toContain(canaryM);
    const [ev] = await sequelize.query<{
      actor_id: string;
      before: Record<string, boolean>;
      after: Record<string, boolean>;
      occurred_at: Date;
    }>(
      `SELECT actor_id, before, after, occurred_at FROM audit_events WHERE school_id = :s AND action = 'sponsor_link.consent' ORDER BY chain_pos DESC LIMIT 1`,
      { replacements: { s: s.school.id }, type: QueryTypes.SELECT },
    );
    expect(ev!.actor_id).toBe(s.people.students[0]!.id);
    expect(ev!.before.shares_outcomes).toBe(true);
    expect(ev!.after.shares_outcomes).toBe(false);
    expect(Date.now() - new Date(ev!.occurred_at).getTime()).toBeLessThan(60_000);
  });

  test("withdrawing milestones too removes the other canary, and the Progress map closes to the sponsor", async () => {
    actAs(s.as.student);
    await changeSharingAction({
      studentId: s.people.students[0]!.id,
      sponsorId: s.people.sponsor.id,
      ...all,
      outcomes: false,
      milestones: false,
    });
    for (const text of [await letterText(), await sponsorPage()]) {
      expect(text).not.toContain(canaryM);
      expect(text).not.toContain(canaryO);
    }
    await expect(progressFor(s.as.sponsor, s.people.students[0]!.id)).rejects.toMatchObject({ status: 404 });
    expect(await auditCount(s.school.id, "sponsor_link.consent")).toBe(2);
    // giving it back shows it again
    await changeSharingAction({ studentId: s.people.students[0]!.id, sponsorId: s.people.sponsor.id, ...all });
    expect(await letterText()).toContain(canaryO);
    expect(await sponsorPage()).toContain(canaryM);
  });

  test("consent to see is not consent to mail: the letter can be withdrawn while sharing stays", async () => {
    actAs(s.as.student);
    await changeSharingAction({ studentId: s.people.students[0]!.id, sponsorId: s.people.sponsor.id, ...all, weeklyLetter: false });
    const [o] = await sponsorOverview(s.as.sponsor);
    expect(o!.letter).toBe("stopped-by-student");
    expect(JSON.stringify(o)).toContain(canaryM); // still sees the milestones
    expect(await weeklyLetterRecipients(s.school.id, "2099-01-05")).toEqual([]);
    actAs(s.as.chief);
    const sent = await sendLetterNowAction({ sponsorId: s.people.sponsor.id, studentId: s.people.students[0]!.id });
    expect(sent).toMatchObject({ ok: false, status: 409 });
    actAs(s.as.student);
    await changeSharingAction({ studentId: s.people.students[0]!.id, sponsorId: s.people.sponsor.id, ...all });
    expect((await weeklyLetterRecipients(s.school.id, "2099-01-05")).map((r) => r.studentId)).toEqual([s.people.students[0]!.id]);
  });

  test("nobody else changes an adult's consent: not another student, not the chief", async () => {
    actAs(s.as.otherStudent);
    expect(
      await changeSharingAction({ studentId: s.people.students[0]!.id, sponsorId: s.people.sponsor.id, ...all, hours: false }),
    ).toMatchObject({
      ok: false,
      status: 404,
    });
    actAs(s.as.chief);
    expect(
      await changeStudentSharingAction({ studentId: s.people.students[0]!.id, sponsorId: s.people.sponsor.id, ...all, hours: false }),
    ).toMatchObject({ ok: false, status: 403 });
    actAs(s.as.sponsor);
    expect(await changeSharingAction({ studentId: s.people.students[0]!.id, sponsorId: s.people.sponsor.id, ...all })).toMatchObject({
      ok: false,
      status: 403,
    });
  });

  test("bad input is a 400 naming the field, and nothing is written", async () => {
    actAs(s.as.student);
    const before = await auditCount(s.school.id, "sponsor_link.consent");
    const res = await changeSharingAction({ studentId: s.people.students[0]!.id, sponsorId: "nope", ...all });
    expect(res).toMatchObject({ ok: false, status: 400, field: "sponsorId" });
    expect(await auditCount(s.school.id, "sponsor_link.consent")).toBe(before);
  });
});

describe("a minor: the school links and manages the guardian", () => {
  test("the minor cannot withdraw the guardian's view; the lead instructor can change it", async () => {
    const minor = s.people.students[1]!;
    const guardian = s.people.sponsor;
    await linkSponsor({ sponsorId: guardian.id, studentId: minor.id, relationship: "guardian" });
    await sequelize.query(`UPDATE people SET birth_date = (now() - interval '15 years')::date WHERE id = :id`, {
      replacements: { id: minor.id },
    });
    actAs({ id: minor.id, name: minor.name, roles: ["student"], schoolId: s.school.id });
    const refused = await changeSharingAction({ studentId: minor.id, sponsorId: guardian.id, ...all, attendance: false });
    expect(refused).toMatchObject({ ok: false, status: 403 });
    expect(refused.ok ? "" : refused.message).toMatch(/under 18/);
    actAs(s.as.instructor); // lead of the minor's cohort
    expect(await changeStudentSharingAction({ studentId: minor.id, sponsorId: guardian.id, ...all, attendance: false })).toMatchObject({
      ok: true,
    });
    actAs(s.as.instructor2); // teaches another cohort: not their student
    expect(await changeStudentSharingAction({ studentId: minor.id, sponsorId: guardian.id, ...all })).toMatchObject({
      ok: false,
      status: 404,
    });
  });
});

describe("the chief's preview and send now", () => {
  test("a double click (same key) and a second click (new key) write one letter in the outbox", async () => {
    actAs(s.as.chief);
    const key = randomUUID();
    const input = { sponsorId: s.people.sponsor.id, studentId: s.people.students[0]!.id, idempotencyKey: key };
    const [a, b] = await Promise.all([sendLetterNowAction(input), sendLetterNowAction(input)]);
    expect(a).toMatchObject({ ok: true, data: { written: true, state: "queued" } });
    expect(b).toMatchObject({ ok: true, data: { written: true } });
    const c = await sendLetterNowAction({ ...input, idempotencyKey: randomUUID() });
    expect(c).toMatchObject({ ok: true, data: { written: false } });
    const rows = await sequelize.query<{ body_text: string }>(
      `SELECT body_text FROM outbox WHERE kind = 'weekly.letter' AND recipient_id = :sp AND idempotency_key LIKE :k`,
      {
        replacements: { sp: s.people.sponsor.id, k: `weekly.letter:${s.people.sponsor.id}:${s.people.students[0]!.id}:%` },
        type: QueryTypes.SELECT,
      },
    );
    expect(rows).toHaveLength(1);
    expect(rows[0]!.body_text).toContain(`Signed off: AER-01 ${canaryM}`);
    actAs(s.as.instructor);
    expect(await sendLetterNowAction({ ...input, idempotencyKey: randomUUID() })).toMatchObject({ ok: false, status: 403 });
  });

  test("a change of consent cancels the queued letter and frees the week for a new one", async () => {
    actAs(s.as.student);
    await changeSharingAction({ studentId: s.people.students[0]!.id, sponsorId: s.people.sponsor.id, ...all, milestones: false });
    const rows = await sequelize.query<{ state: string }>(
      `SELECT state FROM outbox WHERE kind = 'weekly.letter' AND recipient_id = :sp AND idempotency_key LIKE :k`,
      {
        replacements: { sp: s.people.sponsor.id, k: `weekly.letter:${s.people.sponsor.id}:${s.people.students[0]!.id}:%` },
        type: QueryTypes.SELECT,
      },
    );
    expect(rows.map((r) => r.state)).toEqual(["cancelled"]);
    actAs(s.as.chief);
    const again = await sendLetterNowAction({
      sponsorId: s.people.sponsor.id,
      studentId: s.people.students[0]!.id,
      idempotencyKey: randomUUID(),
    });
    expect(again).toMatchObject({ ok: true, data: { written: true } });
    const [fresh] = await sequelize.query<{ body_text: string }>(
      `SELECT body_text FROM outbox WHERE kind = 'weekly.letter' AND recipient_id = :sp AND state = 'queued'`,
      { replacements: { sp: s.people.sponsor.id }, type: QueryTypes.SELECT },
    );
    expect(fresh!.body_text).not.toContain(`Signed off: AER-01 ${canaryM}`); // milestones withdrawn
    expect(fresh!.body_text).toContain(`Oral check on AER-02 ${canaryO}`); // check results still shared
    actAs(s.as.student);
    await changeSharingAction({ studentId: s.people.students[0]!.id, sponsorId: s.people.sponsor.id, ...all });
  });
});

describe("the sponsor's letters", () => {
  test("history: sent letters only, newest first, each readable by its recipient only", async () => {
    const mk = async (subject: string, at: string) => {
      const [o] = await sequelize.query<{ id: string }>(
        `INSERT INTO outbox (school_id, kind, idempotency_key, recipient_id, to_address, subject, body_text, body_html, due_at, state, message_id, sent_at)
         VALUES (:s, 'weekly.letter', :k, :sp, 'x@chalkwing.test', :subject, :body, '<p></p>', :at, 'sent', :mid, :at) RETURNING id`,
        {
          replacements: {
            s: s.school.id,
            k: `weekly.letter:${s.people.sponsor.id}:${s.people.students[0]!.id}:${at.slice(0, 10)}`,
            sp: s.people.sponsor.id,
            subject,
            body: `${subject} body`,
            at,
            mid: `<${randomUUID()}@chalkwing.test>`,
          },
          type: QueryTypes.SELECT,
        },
      );
      await sequelize.query(`INSERT INTO mail_deliveries (outbox_id, message_id, attempts, delivered_at) VALUES (:id, 'm', 1, :at)`, {
        replacements: { id: o!.id, at },
      });
      return o!.id;
    };
    const older = await mk("Older letter", "2026-11-27T17:30:00Z");
    const newer = await mk("Newer letter", "2026-12-04T17:30:00Z");
    const list = await lettersSentTo(s.as.sponsor);
    expect(list.map((l) => l.id)).toEqual([newer, older]);
    expect(list[0]!.studentName).toBe(s.people.students[0]!.name);
    expect((await letterSentTo(s.as.sponsor, older)).text).toBe("Older letter body");
    await expect(letterSentTo(s.as.chief, older)).rejects.toMatchObject({ status: 404 });
  });

  test("after unsubscribing, Today says the letter is off, and the sponsor can turn it back on (audited)", async () => {
    await sequelize.query(`INSERT INTO mail_unsubscribes (sponsor_id, student_id, kind) VALUES (:sp, :st, 'weekly.letter')`, {
      replacements: { sp: s.people.sponsor.id, st: s.people.students[0]!.id },
    });
    const first = async () => (await sponsorOverview(s.as.sponsor)).find((o) => o.studentId === s.people.students[0]!.id)!;
    expect((await first()).letter).toBe("stopped-by-you");
    actAs(s.as.sponsor);
    expect(await resumeLetterAction({ studentId: s.people.students[0]!.id })).toMatchObject({ ok: true, data: { resumed: true } });
    expect((await first()).letter).toBe("on");
    expect(await auditCount(s.school.id, "sponsor_link.letter_resumed")).toBe(1);
    expect(await resumeLetterAction({ studentId: s.people.students[3]!.id })).toMatchObject({ ok: false, status: 404 });
  });
});

describe("the letter covers every day", () => {
  test("a Friday letter carries last Saturday's session and tomorrow's (Saturday) session", async () => {
    const t = await makeSchool("letter-window");
    const st = t.people.students[0]!;
    const b = await makeBriefing(t, "Saturday drag workshop");
    const ahead = await makeBriefing(t, "Saturday speed stability");
    const past = await makeSession(t, b, new Date("2026-12-05T10:00:00Z"), [st.id], "Hangar 2"); // Saturday before
    await makeSession(t, ahead, new Date("2026-12-12T10:00:00Z"), [st.id], "Hangar 3"); // Saturday after
    await sequelize.query(
      `INSERT INTO ground_log_entries (school_id, student_id, course_id, session_id, briefing_revision_id, instructor_id, status, credited_minutes, occurred_at, recorded_by)
       VALUES (:school, :sid, :course, :session, :rev, :i, 'attended', 90, '2026-12-05T10:00:00Z', :i)`,
      {
        replacements: { school: t.school.id, sid: st.id, course: t.course.id, session: past, rev: b.revisionId, i: t.people.instructor.id },
      },
    );
    const link = await letterLink(t.school.id, t.people.sponsor.id, st.id);
    const at = new Date("2026-12-11T17:30:00Z"); // Friday, letter day, 17:30 London
    const data = await weeklyLetterData(link, { id: t.school.id, timeZone: "Europe/London" }, "2026-12-07", at);
    expect(data.attendance?.map((a) => a.title)).toEqual(["Saturday drag workshop"]);
    expect(data.nextWeek?.map((n) => n.title)).toEqual(["Saturday speed stability"]);
    const school = await getSchool(t.school.id);
    const { mail } = await composeLetterFor(link, school, at);
    expect(mail.text).toContain("Saturday speed stability");
    expect(mail.text).toContain("Sat 5 Dec 2026");
    expect(mail.text).toContain("Fri 4 Dec 2026 to Fri 11 Dec 2026");
  });
});
