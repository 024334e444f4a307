// What the worker writes itself, with time moved by the injectable clock value given to
// runDueWork: session reminders (and after a reschedule), and the Weekly letter with only the
// linked student's shared data; delivered over real SMTP on loopback; unsubscribe.
import { randomUUID } from "node:crypto";
import { QueryTypes } from "sequelize";
import { NextRequest } from "next/server";
import { sequelize } from "@/db/index";
import { runDueWork } from "@/lib/mail/producers";
import { deliverOutboxMail } from "@/lib/mail/deliver";
import { smtpTransport } from "@/lib/mail/transport";
import { signUnsubscribe } from "@/lib/mail/unsubscribe-token";
import { inspectUnsubscribe } from "@/db/access/mail/unsubscribe";
import { POST as unsubscribePOST } from "@/app/api/unsubscribe/route";
import { closeDb, makeSchool } from "../../helpers/factories";
import { makeBriefing, makeSession, moveSession, parseStored, testSink } from "./helpers";

jest.setTimeout(60_000);

type School = Awaited<ReturnType<typeof makeSchool>>;
const H = 3600_000;

afterAll(closeDb);

async function reminderRows(sessionId: string) {
  return sequelize.query<{ id: string; idempotency_key: string; state: string; to_address: string; recipient_id: string; subject: string }>(
    `SELECT id, idempotency_key, state, to_address, recipient_id, subject FROM outbox WHERE kind = 'session.reminder' AND idempotency_key LIKE :p ORDER BY to_address`,
    { replacements: { p: `session.reminder:${sessionId}:%` }, type: QueryTypes.SELECT },
  );
}

async function deliverAll(ids: string[], port: number) {
  const transport = smtpTransport({ port });
  try {
    for (const id of ids) expect(await deliverOutboxMail(id, { transport, final: false })).toBe("sent");
  } finally {
    transport.close();
  }
}

describe("session reminders", () => {
  let s: School;
  let briefing: { id: string; revisionId: string };
  beforeAll(async () => {
    s = await makeSchool("mail-remind");
    briefing = await makeBriefing(s, "Drag and the minimum-drag speed");
  });

  test("one reminder per attendee once the clock reaches the lead time (24 h), and not before", async () => {
    const startsAt = new Date("2027-01-12T09:00:00Z");
    const attendees = s.people.students.slice(0, 3);
    const sessionId = await makeSession(
      s,
      briefing,
      startsAt,
      attendees.map((p) => p.id),
    );

    await runDueWork(new Date(startsAt.getTime() - 24 * H - 60_000));
    expect(await reminderRows(sessionId)).toHaveLength(0);

    await runDueWork(new Date(startsAt.getTime() - 24 * H + 60_000));
    await runDueWork(new Date(startsAt.getTime() - 23 * H)); // a second tick writes nothing more
    const rows = await reminderRows(sessionId);
    expect(rows.map((r) => r.recipient_id).sort()).toEqual(attendees.map((p) => p.id).sort());
    expect(rows.every((r) => r.idempotency_key.startsWith(`session.reminder:${sessionId}:0:`))).toBe(true);

    const sink = await testSink();
    try {
      await deliverAll(
        rows.map((r) => r.id),
        sink.port,
      );
      expect(sink.received.map((m) => m.envelopeTo[0]).sort()).toEqual(attendees.map((p) => p.email).sort());
      const mail = await parseStored(sink, sink.received[0]!.file);
      // 09:00 UTC on 12 January is 09:00 in London (GMT in winter)
      expect(mail.subject).toBe("Reminder: Drag and the minimum-drag speed, Tue 12 Jan 2027, 09:00");
      expect(mail.text).toContain(s.school.name);
      expect(mail.html).toContain("10:30"); // the end time
    } finally {
      await sink.close();
    }
  });

  test("the school's lead time is used: 48 h", async () => {
    const s2 = await makeSchool("mail-lead");
    await sequelize.query(`UPDATE schools SET settings = settings || '{"reminderLeadHours": 48}'::jsonb WHERE id = :id`, {
      replacements: { id: s2.school.id },
    });
    const b2 = await makeBriefing(s2, "Speed stability");
    const startsAt = new Date("2027-01-20T10:00:00Z");
    const sessionId = await makeSession(s2, b2, startsAt, [s2.people.students[0]!.id]);
    await runDueWork(new Date(startsAt.getTime() - 48 * H - 60_000));
    expect(await reminderRows(sessionId)).toHaveLength(0);
    await runDueWork(new Date(startsAt.getTime() - 48 * H + 60_000));
    expect(await reminderRows(sessionId)).toHaveLength(1);
  });

  test("a reschedule after the reminder went out gives exactly one new reminder, at the new lead time", async () => {
    const startsAt = new Date("2027-01-14T09:00:00Z");
    const attendees = s.people.students.slice(0, 2);
    const sessionId = await makeSession(
      s,
      briefing,
      startsAt,
      attendees.map((p) => p.id),
    );
    const clock = new Date(startsAt.getTime() - 20 * H);
    await runDueWork(clock);
    const first = await reminderRows(sessionId);
    expect(first).toHaveLength(2);
    const sink = await testSink();
    try {
      await deliverAll(
        first.map((r) => r.id),
        sink.port,
      );

      const newStart = new Date("2027-01-16T13:00:00Z");
      await moveSession(sessionId, newStart);
      await runDueWork(clock); // the new time is still more than 24 h away
      expect(await reminderRows(sessionId)).toHaveLength(2);

      const later = new Date(newStart.getTime() - 24 * H + 60_000);
      await runDueWork(later);
      await runDueWork(new Date(later.getTime() + H));
      const all = await reminderRows(sessionId);
      const fresh = all.filter((r) => r.idempotency_key.startsWith(`session.reminder:${sessionId}:1:`));
      expect(fresh.map((r) => r.recipient_id).sort()).toEqual(attendees.map((p) => p.id).sort());
      expect(all).toHaveLength(4);

      await deliverAll(
        fresh.map((r) => r.id),
        sink.port,
      );
      expect(sink.received).toHaveLength(4);
      const perPerson = new Map<string, number>();
      for (const m of sink.received) perPerson.set(m.envelopeTo[0]!, (perPerson.get(m.envelopeTo[0]!) ?? 0) + 1);
      expect([...perPerson.values()]).toEqual([2, 2]);
      const newest = await parseStored(sink, sink.received[3]!.file);
      expect(newest.subject).toContain("Sat 16 Jan 2027, 13:00");
    } finally {
      await sink.close();
    }
  });

  test("a reschedule before the reminder was sent cancels the queued one and leaves one for the new time", async () => {
    const startsAt = new Date("2027-01-19T09:00:00Z");
    const attendee = s.people.students[2]!;
    const sessionId = await makeSession(s, briefing, startsAt, [attendee.id]);
    const clock = new Date(startsAt.getTime() - 10 * H);
    await runDueWork(clock);
    expect(await reminderRows(sessionId)).toHaveLength(1);
    await moveSession(sessionId, new Date(startsAt.getTime() + 2 * H)); // still inside the window
    await runDueWork(clock);
    const rows = await reminderRows(sessionId);
    expect(rows.map((r) => [r.idempotency_key.split(":")[2], r.state]).sort()).toEqual([
      ["0", "cancelled"],
      ["1", "queued"],
    ]);
  });
});

describe("overdue-assignment reminders", () => {
  test("the day after the due date (school calendar), once, to each student of the cohort who has not marked it done", async () => {
    const s = await makeSchool("mail-overdue");
    const b = await makeBriefing(s, "Read before the drag session");
    const [a] = await sequelize.query<{ id: string }>(
      `INSERT INTO assignments (school_id, kind, briefing_id, cohort_id, due_on, assigned_by) VALUES (:s, 'briefing', :b, :c, '2027-02-03', :i) RETURNING id`,
      { replacements: { s: s.school.id, b: b.id, c: s.cohorts.a.id, i: s.people.instructor.id }, type: QueryTypes.SELECT },
    );
    const [done, ...rest] = s.people.students.slice(0, 3);
    await sequelize.query(`INSERT INTO assignment_completions (assignment_id, student_id, completed_at) VALUES (:a, :s, now())`, {
      replacements: { a: a!.id, s: done!.id },
    });
    const rows = () =>
      sequelize.query<{ recipient_id: string; subject: string }>(
        `SELECT recipient_id, subject FROM outbox WHERE kind = 'assignment.overdue' AND idempotency_key LIKE :p`,
        {
          replacements: { p: `assignment.overdue:${a!.id}:%` },
          type: QueryTypes.SELECT,
        },
      );
    await runDueWork(new Date("2027-02-03T23:30:00Z")); // still the due date in London
    expect(await rows()).toHaveLength(0);
    await runDueWork(new Date("2027-02-04T00:30:00Z"));
    await runDueWork(new Date("2027-02-05T09:00:00Z"));
    const written = await rows();
    expect(written.map((r) => r.recipient_id).sort()).toEqual(rest.map((p) => p!.id).sort());
    expect(written[0]!.subject).toBe("Overdue briefing: Read before the drag session (was due Wed 3 Feb 2027)");
  });
});

describe("the Weekly letter", () => {
  let s: School;
  const canary = `CANARY${randomUUID().slice(0, 6).toUpperCase()}`;
  // Friday 11 December 2026, 17:30 in London: the default letter day (5) after 17:00
  const letterTime = new Date("2026-12-11T17:30:00Z");
  let student: { id: string; name: string; email: string };
  let other: { id: string; name: string; email: string };

  beforeAll(async () => {
    s = await makeSchool("mail-letter");
    student = s.people.students[0]!; // linked to the sponsor by makeSchool
    other = s.people.students[1]!;
    // every field of the second student carries the canary
    await sequelize.query(`UPDATE people SET name = :n, email = :e WHERE id = :id`, {
      replacements: { n: `${canary}-name Person`, e: `${canary.toLowerCase()}-mail@chalkwing.test`, id: other.id },
    });
    other = { ...other, name: `${canary}-name Person` };
    const own = await makeBriefing(s, "Own session: drag polar");
    const theirs = await makeBriefing(s, `${canary}-briefing`);
    const ownNext = await makeBriefing(s, "Own next week: speed stability");
    const ownSession = await makeSession(s, own, new Date("2026-12-08T10:00:00Z"), [student.id], "Own room");
    const theirSession = await makeSession(s, theirs, new Date("2026-12-09T10:00:00Z"), [other.id], `${canary}-room`);
    await makeSession(s, ownNext, new Date("2026-12-15T10:00:00Z"), [student.id], "Own room");
    await makeSession(s, theirs, new Date("2026-12-16T10:00:00Z"), [other.id], `${canary}-room2`);
    const log = (sid: string, sessionId: string, rev: string, status: string, minutes: number, at: string) =>
      sequelize.query(
        `INSERT INTO ground_log_entries (school_id, student_id, course_id, session_id, briefing_revision_id, instructor_id, status, credited_minutes, occurred_at, recorded_by)
         VALUES (:school, :sid, :course, :session, :rev, :i, :status, :m, :at, :i)`,
        {
          replacements: {
            school: s.school.id,
            sid,
            course: s.course.id,
            session: sessionId,
            rev,
            i: s.people.instructor.id,
            status,
            m: minutes,
            at,
          },
        },
      );
    await log(student.id, ownSession, own.revisionId, "attended", 90, "2026-12-08T10:00:00Z");
    await log(other.id, theirSession, theirs.revisionId, "absent", 0, "2026-12-09T10:00:00Z");
    // the other student's hours would show as 7.7 h: 463 minutes
    const extra = await makeSession(s, theirs, new Date("2026-12-10T12:00:00Z"), [other.id], `${canary}-room3`);
    await log(other.id, extra, theirs.revisionId, "attended", 463, "2026-12-10T12:00:00Z");
    const [item] = await sequelize.query<{ id: string }>(`SELECT id FROM syllabus_items WHERE revision_id = :r AND code = 'AER-04'`, {
      replacements: { r: s.revision.id },
      type: QueryTypes.SELECT,
    });
    await sequelize.query(
      `INSERT INTO makeup_items (school_id, student_id, syllabus_item_id, source_kind, source_id) VALUES (:s, :st, :item, 'absence', :src)`,
      { replacements: { s: s.school.id, st: other.id, item: item!.id, src: theirSession } },
    );
    await sequelize.query(
      `INSERT INTO sponsor_notes (school_id, student_id, author_id, body, created_at) VALUES (:s, :st, :a, :b, :at), (:s, :st2, :a, :b2, :at)`,
      {
        replacements: {
          s: s.school.id,
          st: other.id,
          st2: student.id,
          a: s.people.instructor.id,
          b: `${canary}-note`,
          b2: "Steady progress on the drag curve.",
          at: "2026-12-10T09:00:00Z",
        },
      },
    );
    // the student does not share the schedule with this sponsor
    await sequelize.query(`UPDATE sponsor_links SET shares_schedule = false WHERE sponsor_id = :sp AND student_id = :st`, {
      replacements: { sp: s.people.sponsor.id, st: student.id },
    });
  });

  async function letterRows(sponsorId: string) {
    return sequelize.query<{ id: string; idempotency_key: string; state: string; subject: string }>(
      `SELECT id, idempotency_key, state, subject FROM outbox WHERE kind = 'weekly.letter' AND recipient_id = :sp ORDER BY created_at`,
      { replacements: { sp: sponsorId }, type: QueryTypes.SELECT },
    );
  }

  test("not before the letter day's hour; then one letter per week", async () => {
    await runDueWork(new Date("2026-12-11T16:30:00Z"));
    expect(await letterRows(s.people.sponsor.id)).toHaveLength(0);
    await runDueWork(letterTime);
    await runDueWork(new Date("2026-12-12T09:00:00Z"));
    const rows = await letterRows(s.people.sponsor.id);
    expect(rows.map((r) => r.idempotency_key)).toEqual([`weekly.letter:${s.people.sponsor.id}:${student.id}:2026-12-07`]);
  });

  test("carries the linked student's shared data and none of the second student's, in subject, HTML, text and alt text", async () => {
    const [row] = await letterRows(s.people.sponsor.id);
    const sink = await testSink();
    try {
      await deliverAll([row!.id], sink.port);
      const mail = await parseStored(sink, sink.received[0]!.file);
      const html = String(mail.html);
      const text = mail.text ?? "";
      const subject = mail.subject ?? "";
      const altTexts = [...html.matchAll(/\s(?:alt|aria-label|title)="([^"]*)"/g)].map((m) => m[1]).join("\n");
      expect(altTexts).toContain("1.5 h of the 35 h Test ground course minimum: 4%"); // the progress bar says its numbers

      for (const part of [subject, html, text, altTexts]) {
        expect(part.toLowerCase()).not.toContain(canary.toLowerCase());
        expect(part).not.toContain(other.id);
        expect(part).not.toContain("AER-04"); // the other student's make-up
        expect(part).not.toContain("7.7 h");
        expect(part).not.toContain("missed");
      }
      expect(subject).toBe(`Weekly letter: ${student.name}, week of Mon 7 Dec 2026`);
      for (const part of [html, text]) {
        expect(part).toContain("Own session: drag polar");
        expect(part).toContain("1.5 h"); // this week's credited hours
        expect(part).toContain("1.5 of 35 h");
        expect(part).toContain("Steady progress on the drag curve.");
        expect(part).toContain("On track");
        expect(part).not.toContain("Own next week"); // the schedule is not shared with this sponsor
      }
      // RFC 8058 one-click: both headers, the first naming an HTTPS-or-app URL with the token
      const line = (k: string) => mail.headerLines.find((h) => h.key === k)?.line.replace(/\r?\n\s+/g, " ");
      expect(line("list-unsubscribe-post")).toBe("List-Unsubscribe-Post: List-Unsubscribe=One-Click");
      expect(line("list-unsubscribe")).toMatch(/^List-Unsubscribe: <http:\/\/127\.0\.0\.1:\d+\/api\/unsubscribe\?token=[\w.-]+>$/);
    } finally {
      await sink.close();
    }
  });

  test("unsubscribe: the page's GET changes nothing, a forged or swapped token is refused, a POST stops the letter", async () => {
    const [row] = await sequelize.query<{ headers: Record<string, string> }>(
      `SELECT headers FROM outbox WHERE kind = 'weekly.letter' AND recipient_id = :sp LIMIT 1`,
      { replacements: { sp: s.people.sponsor.id }, type: QueryTypes.SELECT },
    );
    const oneClick = /^<(.+)>$/.exec(row!.headers["List-Unsubscribe"]!)![1]!;
    const token = new URL(oneClick).searchParams.get("token")!;
    const count = async () => {
      const [n] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM mail_unsubscribes WHERE sponsor_id = :sp`, {
        replacements: { sp: s.people.sponsor.id },
        type: QueryTypes.SELECT,
      });
      return n!.n;
    };

    const view = await inspectUnsubscribe(token); // what the confirmation page reads
    expect(view).toMatchObject({ claim: { sponsorId: s.people.sponsor.id, studentId: student.id, kind: "weekly.letter" }, already: false });
    expect(await count()).toBe(0);

    const post = (t: string) =>
      unsubscribePOST(
        new NextRequest(`http://127.0.0.1:3206/api/unsubscribe?token=${encodeURIComponent(t)}`, {
          method: "POST",
          headers: { "content-type": "application/x-www-form-urlencoded" },
          body: "List-Unsubscribe=One-Click",
        }),
      );

    const [payload, mac] = token.split(".") as [string, string];
    const forged = `${payload}.${mac.slice(0, -2)}${mac.endsWith("AA") ? "BB" : "AA"}`;
    const otherToken = signUnsubscribe({ sponsorId: s.people.sponsor.id, studentId: other.id, kind: "weekly.letter" });
    const swapped = `${Buffer.from(`v1:${s.people.sponsor.id}:${other.id}:weekly.letter`).toString("base64url")}.${mac}`;
    for (const bad of [forged, swapped, otherToken, "not-a-token"]) {
      const res = await post(bad);
      expect(res.status).toBe(400);
      expect(await res.json()).toEqual({ error: { status: 400, message: "token: not a valid unsubscribe link", field: "token" } });
    }
    expect(await count()).toBe(0);

    const res = await post(token);
    expect(res.status).toBe(200);
    expect(await count()).toBe(1);
    expect(await post(token).then((r) => r.status)).toBe(200); // twice is fine

    // next week's letter day: no letter for this sponsor and student
    await runDueWork(new Date("2026-12-18T17:30:00Z"));
    const rows = await letterRows(s.people.sponsor.id);
    expect(rows).toHaveLength(1);
    expect(rows[0]!.idempotency_key).toContain("2026-12-07");
  });
});
