// Bidirectional control characters typed into a name, a title or a reason never reach a mail:
// an override (U+202E) could make "gpj.exe" read as "exe.jpg" or reorder a sentence.
import { composeMail } from "@/lib/mail/compose";
import { composeWeeklyLetter } from "@/lib/mail/letter";

const school = { name: "Larkhollow\u2067 Flying School", timeZone: "Europe/London" };
const BIDI = /[\u202A-\u202E\u2066-\u2069]/;

test("a cancelled-session mail carries no bidi control in subject, text or HTML", () => {
  const mail = composeMail(
    "session.cancelled",
    {
      name: "Ada\u202E Lark",
      briefingTitle: "Drag \u2066and\u2069 the polar",
      startsAt: new Date("2026-07-02T08:00:00Z"),
      room: "Room\u202D 2",
      reason: "instructor ill\u202Bexe.gpj",
    },
    school,
  );
  for (const part of [mail.subject, mail.text, mail.html]) expect(part).not.toMatch(BIDI);
  expect(mail.text).toContain("Hello Ada,"); // greeted by first name, the control stripped
  expect(mail.text).toContain("instructor illexe.gpj");
  expect(mail.subject).toContain("Drag and the polar");
});

test("the Weekly letter carries none either", () => {
  const mail = composeWeeklyLetter(
    {
      sponsorName: "Sam\u202E Sponsor",
      studentName: "Ada\u2068 Lark",
      weekStart: "2026-07-06",
      unsubscribeUrl: "http://127.0.0.1:3000/unsubscribe/abc",
      oneClickUrl: "http://127.0.0.1:3000/api/unsubscribe?t=abc",
    } as Parameters<typeof composeWeeklyLetter>[0],
    school,
  );
  for (const part of [mail.subject, mail.text, mail.html]) expect(part).not.toMatch(BIDI);
  expect(mail.subject).toContain("Ada Lark");
});
