// Consent and sponsors, the sponsor's letters, the chief's Weekly letters (issue 14).
import type { AuthzTable } from "../types";

const everything = { attendance: true, hours: true, milestones: true, outcomes: true, schedule: true, weeklyLetter: true };

export const SHARING_TABLE: AuthzTable = {
  "action app/(app)/sharing/actions.ts#changeSharingAction": {
    // the seeded consent (everything shared), so the student's positive call changes nothing others rely on
    request: (fx) => ({ args: [{ studentId: fx.student, sponsorId: fx.sponsor, ...everything }] }),
    expect: {
      signedOut: 401,
      chief: 403,
      instructor: 403,
      student: { status: 200, check: (res) => expect(res.json).toMatchObject({ ok: true, data: { changed: false } }) },
      sponsor: 403,
    },
    mutates: true,
  },
  "action app/(app)/sharing/actions.ts#changeStudentSharingAction": {
    // the demo student is an adult: staff may read their sponsors but never change an adult's choice
    request: (fx) => ({ args: [{ studentId: fx.student, sponsorId: fx.sponsor, ...everything, hours: false }] }),
    expect: { signedOut: 401, chief: 403, instructor: 403, student: 403, sponsor: 403 },
  },
  "action app/(app)/sharing/actions.ts#setBirthDateAction": {
    // the demo student has no date of birth on file: the chief's clearing call changes nothing (and
    // keeps the student an adult, who decides their own sharing, as the rows above rely on)
    request: (fx) => ({ args: [{ studentId: fx.student, birthDate: "" }] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(res.json).toMatchObject({ ok: true, data: { birthDate: null, changed: false } }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
  },
  "action app/(app)/letters/actions.ts#resumeLetterAction": {
    request: (fx) => ({ args: [{ studentId: fx.student }] }),
    expect: {
      signedOut: 401,
      chief: 403,
      instructor: 403,
      student: 403,
      sponsor: { status: 200, check: (res) => expect(res.json).toMatchObject({ ok: true }) },
    },
    mutates: true,
  },
  "action app/(app)/mail/actions.ts#sendLetterNowAction": {
    // the demo sponsor does not sponsor the Merlin student: 404 after the permission check, nothing written
    request: (fx) => ({ args: [{ sponsorId: fx.sponsor, studentId: fx.otherStudent }] }),
    expect: { signedOut: 401, chief: 404, instructor: 403, student: 403, sponsor: 403 },
    secrets: (fx) => [fx.otherStudent],
  },
};
