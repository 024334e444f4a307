// composeMail and the Weekly letter composer: both parts, the school's name, times in the
// school's zone, every user string escaped, headers on one line, unsubscribe tokens.
import { composeMail, MAIL_KINDS, type MailDataByKind } from "@/lib/mail/compose";
import { composeWeeklyLetter, progressBar } from "@/lib/mail/letter";
import { signUnsubscribe, verifyUnsubscribe } from "@/lib/mail/unsubscribe-token";

const school = { name: "Larkhollow Flying School", timeZone: "Europe/London" };
// one word, so that even a greeting by first name carries all of it
const evil = `<script>alert("x")</script>&'quote'`;

const samples: { [K in keyof MailDataByKind]: MailDataByKind[K] } = {
  invitation: { name: evil, setPasswordUrl: "http://127.0.0.1:3000/set-password/abc", expiresAt: new Date("2026-07-08T10:00:00Z") },
  "session.rescheduled": {
    name: evil,
    briefingTitle: evil,
    previousStartsAt: new Date("2026-07-01T08:00:00Z"),
    startsAt: new Date("2026-07-02T08:00:00Z"),
    endsAt: new Date("2026-07-02T09:30:00Z"),
    room: evil,
    instructorName: evil,
  },
  "session.cancelled": { name: evil, briefingTitle: evil, startsAt: new Date("2026-07-01T08:00:00Z"), room: evil, reason: evil },
  "assignment.new": { name: evil, title: evil, assignmentKind: "briefing", dueOn: "2026-07-03", path: "/assignments#a-1" },
  "record.signed": { name: evil, itemCode: "AER-03", itemTitle: evil, signerName: evil, signedOn: "2026-07-01" },
  "check.notyet": { name: evil, itemCodes: ["AER-01", evil], checkedOn: "2026-07-01" },
  "session.reminder": {
    name: evil,
    briefingTitle: evil,
    startsAt: new Date("2026-07-02T08:00:00Z"),
    endsAt: new Date("2026-07-02T09:30:00Z"),
    room: evil,
    instructorName: evil,
  },
  "assignment.overdue": { name: evil, title: evil, assignmentKind: "demo", dueOn: "2026-07-03", path: "/assignments#a-1" },
};

describe.each(MAIL_KINDS)("composeMail(%s)", (kind) => {
  const mail = composeMail(kind, samples[kind] as never, school);
  test("has a subject, a plain-text and an HTML part naming the school", () => {
    expect(mail.subject.length).toBeGreaterThan(5);
    expect(mail.text).toContain(school.name);
    expect(mail.html).toContain(school.name);
    expect(mail.html).toMatch(/^<!DOCTYPE html>/);
    expect(mail.html).toContain('role="presentation"');
    expect(`${mail.subject}${mail.text}${mail.html}`).not.toMatch(/undefined|NaN|\[object Object\]/);
  });
  test("escapes every user string in the HTML and keeps the subject on one line", () => {
    expect(mail.html).not.toContain("<script>");
    expect(mail.html).toContain("&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;&amp;&#39;quote&#39;");
    expect(mail.subject).not.toMatch(/[\r\n]/);
  });
});

test("times are shown in the school's zone: 08:00 UTC in July is 09:00 in London (BST)", () => {
  const m = composeMail("session.rescheduled", { ...samples["session.rescheduled"], briefingTitle: "Drag" }, school);
  expect(m.subject).toBe("Session moved: Drag, now Thu 2 Jul 2026, 09:00");
  expect(m.text).toContain("Thu 2 Jul 2026, 09:00 to 10:30");
  expect(m.text).toContain("Was: Wed 1 Jul 2026, 09:00");
  const ny = composeMail(
    "session.rescheduled",
    { ...samples["session.rescheduled"], briefingTitle: "Drag" },
    { ...school, timeZone: "America/New_York" },
  );
  expect(ny.subject).toBe("Session moved: Drag, now Thu 2 Jul 2026, 04:00");
});

test("links are absolute, and a path that leaves the app is refused", () => {
  const m = composeMail("assignment.new", { ...samples["assignment.new"] }, school);
  expect(m.text).toMatch(/https?:\/\/[^/]+\/assignments#a-1/);
  expect(() => composeMail("assignment.new", { ...samples["assignment.new"], path: "//evil.test/x" }, school)).toThrow("path");
});

test("a line break in a title cannot add a header", () => {
  const m = composeMail("record.signed", { ...samples["record.signed"], itemTitle: "Drag\r\nBcc: victim@example.test" }, school);
  expect(m.subject).toBe("Signed off: AER-03 Drag Bcc: victim@example.test");
});

describe("the Weekly letter", () => {
  const base = {
    sponsorName: "Mara Quill",
    studentName: "Ada Quill",
    weekStart: "2026-12-07",
    unsubscribeUrl: "http://127.0.0.1:3000/unsubscribe/t",
    oneClickUrl: "http://127.0.0.1:3000/api/unsubscribe?token=t",
  };
  test("leaves out every section the student does not share", () => {
    const m = composeWeeklyLetter({ ...base }, school);
    for (const heading of ["This week's sessions", "Ground training hours", "Progress", "Next week"]) expect(m.text).not.toContain(heading);
    expect(m.headers).toEqual({ "List-Unsubscribe": `<${base.oneClickUrl}>`, "List-Unsubscribe-Post": "List-Unsubscribe=One-Click" });
    expect(m.text).toContain(base.unsubscribeUrl);
  });
  test("says behind with the plain reasons and the make-ups to book", () => {
    const m = composeWeeklyLetter(
      {
        ...base,
        progress: {
          signedItems: [{ code: "AER-01", title: "Zero-lift drag" }],
          stagesPassed: [],
          makeupsToBook: [{ code: "AER-02", title: "Lift-dependent drag" }],
          lateAssignments: 0,
          missedSessions: 0,
        },
      },
      school,
    );
    expect(m.text).toContain("Behind: one thing needs catching up.\n\n- one make-up item is still to be booked");
    expect(m.text).toContain("Signed off: AER-01 Zero-lift drag");
    expect(m.text).toContain("Action needed");
    expect(m.text).toContain("- AER-02 Lift-dependent drag");
  });
  test("the progress bar is a table whose cells add to 100 % and whose label says the numbers", () => {
    const b = progressBar(22.5 * 60, 35 * 60, "22.5 of 35 h");
    expect(b.html).toContain('width="64%"');
    expect(b.html).toContain('width="36%"');
    expect(b.html).toContain('aria-label="22.5 of 35 h: 64%"');
    expect(b.text).toBe("[#############.......] 22.5 of 35 h: 64%");
    expect(progressBar(50, 40, "x").html).toContain('width="100%"');
    expect(progressBar(0, 0, "x").html).toContain('width="100%"'); // all empty
  });
});

describe("unsubscribe tokens", () => {
  const sp = "2aea1736-5c75-4268-8bda-223f2e35e8b7";
  const st = "03360429-3c04-4155-8a92-3d5ffc90ca3a";
  const st2 = "13360429-3c04-4155-8a92-3d5ffc90ca3b";
  beforeAll(() => {
    process.env.CHALKWING_SIGNING_SECRET = "unit-test-signing-secret-0123456789";
  });
  test("a genuine token names its sponsor, student and kind", () => {
    expect(verifyUnsubscribe(signUnsubscribe({ sponsorId: sp, studentId: st, kind: "weekly.letter" }))).toEqual({
      sponsorId: sp,
      studentId: st,
      kind: "weekly.letter",
    });
  });
  test("altered, swapped, re-signed with another secret, or malformed tokens are refused", () => {
    const good = signUnsubscribe({ sponsorId: sp, studentId: st, kind: "weekly.letter" });
    const other = signUnsubscribe({ sponsorId: sp, studentId: st2, kind: "weekly.letter" });
    const [p1, m1] = good.split(".") as [string, string];
    const [p2, m2] = other.split(".") as [string, string];
    expect(verifyUnsubscribe(`${p2}.${m1}`)).toBeNull(); // payload of one, signature of the other
    expect(verifyUnsubscribe(`${p1}.${m2}`)).toBeNull();
    expect(verifyUnsubscribe(`${p1}.${m1.slice(0, -1)}${m1.endsWith("A") ? "B" : "A"}`)).toBeNull();
    expect(verifyUnsubscribe(`${Buffer.from(`v1:${sp}:${st}:session.reminder`).toString("base64url")}.${m1}`)).toBeNull();
    expect(verifyUnsubscribe("")).toBeNull();
    expect(verifyUnsubscribe("a.b.c")).toBeNull();
    process.env.CHALKWING_SIGNING_SECRET = "another-secret-entirely-0123456789";
    expect(verifyUnsubscribe(good)).toBeNull();
  });
});

test("mail greets by first name, in the one date style", () => {
  const m = composeMail(
    "record.signed",
    { name: "Imogen Farrant", itemCode: "AER-03", itemTitle: "Drag", signerName: "Tomasz Varga", signedOn: "2026-12-03" },
    school,
  );
  expect(m.text).toContain("Hello Imogen,");
  expect(m.text).not.toContain("Hello Imogen Farrant");
  expect(m.text).toContain("Thu 3 Dec 2026");
});
