// The authorisation table: for every endpoint derived from the code (see derive.ts) and every
// caller, the expected answer. The harness (harness.test.ts) fails when an endpoint is missing
// here, or when a row names an endpoint that no longer exists.
//
// How to add a row (one per route-handler method and per server action):
//   "GET /api/<area>/[id]": {
//     request: (fx) => ({ params: { id: fx.somethingOfTheStudent }, query: "a=1" }),
//     expect: { signedOut: 401, chief: { status: 200, check: (res, fx) => ... }, instructor: 200, student: 403, sponsor: 403 },
//     secrets: (fx) => [fx.somethingOfTheStudent, "Ada Quill"],   // must never come back in a refused answer
//   },
//   "action app/(app)/<area>/actions.ts#doThingAction": {
//     request: (fx, caller) => ({ args: [{ thingId: fx.thing }] }),
//     expect: { signedOut: 401, chief: 200, instructor: 200, student: 403, sponsor: 403 },
//     mutates: true,   // the allowed calls change rows by design
//   },
// Keys: route handlers are "<METHOD> <app-dir path>" (route groups dropped, dynamic segments kept,
// e.g. "POST /api/briefings/[briefingId]/handouts"); actions are "action <file>#<exportedName>".
// An action's answer maps to a status: { ok: true } → 200, { ok: false, status } → status.
// Positive cells (2xx) should check the caller gets their own data: use `check`, which may throw
// (jest expect works). Refused cells are checked automatically for "no rows changed" and "no
// uuid the caller was not given, no `secrets` string" in the body.
// Fixture ids (fx.*) come from fixtures.ts: add a lookup there for anything new you need.
// Other areas: add your rows in your own block below, marked with your area's name.
import type { AuthzTable, HarnessResponse } from "./types";
import { CURVE_LAB_TABLE } from "./curve-lab-table";
import { TIMETABLE_TABLE } from "./timetable-table";
import { BRIEFINGS_TABLE } from "./briefings/table";
import { RECORDS_TABLE } from "./records/table";
import { PEOPLE_TABLE } from "./people/table";
import { PRACTICE_TABLE } from "./practice/table";
import { SHARING_TABLE } from "./sharing/table";
import { ROOMS_TABLE } from "./rooms/table";
import { COHORTS_TABLE } from "./cohorts/table";
import { ENDORSEMENTS_TABLE } from "./endorsements/table";
import { COMPLETION_TABLE } from "./completion/table";
import { INSPECTION_TABLE } from "./inspection/table";
import { TRANSFERS_TABLE } from "./transfers/table";
import { RETENTION_TABLE } from "./retention/table";
import { DIRECTORY_TABLE } from "./directory/table";

function rowsOf(res: HarnessResponse): { id: string; primary: string }[] {
  const j = res.json as { rows?: { id: string; primary: string }[] } | undefined;
  if (!j || !Array.isArray(j.rows)) throw new Error(`expected { rows: [...] }, got ${res.text.slice(0, 200)}`);
  return j.rows;
}
function ids(res: HarnessResponse): string[] {
  return rowsOf(res).map((r) => r.id);
}

export const TABLE: AuthzTable = {
  // ---- foundation ----
  "GET /api/auth/[...nextauth]": { skip: "next-auth's own endpoints; covered by tests/e2e/sign-in.test.ts" },
  "POST /api/auth/[...nextauth]": { skip: "next-auth's own endpoints; covered by tests/e2e/sign-in.test.ts" },

  "GET /api/health": {
    expect: {
      signedOut: { status: 200, check: (res) => expect(res.json).toEqual({ status: "ok", database: "ok" }) },
      chief: 200,
      instructor: 200,
      student: 200,
      sponsor: 200,
    },
  },

  "GET /api/today": {
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res, fx) => {
          // the chief sees every cohort of the school
          expect(ids(res)).toEqual(expect.arrayContaining([fx.kestrelCohort, fx.merlinCohort]));
        },
      },
      instructor: {
        status: 200,
        check: (res, fx) => {
          // the Kestrel cohort's lead sees its students, not the Merlin cohort's
          expect(ids(res)).toContain(fx.student);
          expect(ids(res)).not.toContain(fx.otherStudent);
        },
      },
      student: {
        status: 200,
        check: (res, fx) => {
          // the items of the student's current stage, and nobody's person id
          expect(rowsOf(res).map((r) => r.primary)).toContain("AER-03 Total drag and the minimum-drag speed");
          expect(res.text).not.toContain(fx.otherStudent);
          expect(res.text).not.toContain(fx.cohortmate);
        },
      },
      sponsor: {
        status: 200,
        check: (res, fx) => {
          // only the linked student
          expect(ids(res)).toEqual([fx.student]);
        },
      },
    },
  },

  "action app/(app)/today/actions.ts#unlockAccountAction": {
    request: (fx) => ({ args: [{ personId: fx.lockedPerson }] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(res.json).toMatchObject({ ok: true, data: { unlocked: 1 } }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
    secrets: (fx) => [fx.lockedPerson, "locked.harness@chalkwing.test"],
  },

  "POST /api/people/[personId]/unlock": {
    request: (fx) => ({ params: { personId: fx.lockedPerson2 }, body: {} }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(res.json).toEqual({ unlocked: 1 }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
    secrets: (fx) => [fx.lockedPerson2, "locked2.harness@chalkwing.test"],
  },

  // ---- other areas: add your blocks below ----
  // ---- Curve Lab (curve-lab-table.ts) ----
  ...CURVE_LAB_TABLE,
  // ---- timetable, rosters, attendance, Ground log (timetable-table.ts) ----
  ...TIMETABLE_TABLE,

  // ---- briefings, handouts, assignments, syllabus revisions (briefings/table.ts) ----
  ...BRIEFINGS_TABLE,

  // ---- records: oral checks, sign-offs, stage checks, register, Progress map (records/table.ts) ----
  ...RECORDS_TABLE,

  // ---- people: instructor files (people/table.ts) ----
  ...PEOPLE_TABLE,

  // ---- practice questions (practice/table.ts) ----
  ...PRACTICE_TABLE,

  // ---- consent and sponsors, the sponsor's letters, the chief's Weekly letters (sharing/table.ts) ----
  ...SHARING_TABLE,

  // ---- rooms (rooms/table.ts) ----
  ...ROOMS_TABLE,

  // ---- cohorts (cohorts/table.ts) ----
  ...COHORTS_TABLE,

  // ---- knowledge-test endorsements (endorsements/table.ts) ----
  ...ENDORSEMENTS_TABLE,
  ...COMPLETION_TABLE,

  // ---- the inspection pack (inspection/table.ts) ----
  ...INSPECTION_TABLE,
  // ---- transfers in and retention ----
  ...TRANSFERS_TABLE,
  ...RETENTION_TABLE,

  // ---- search pickers over growing sets (directory/table.ts) ----
  ...DIRECTORY_TABLE,

  // ---- mail ----
  // Public by design (the signed token is the credential): a forged token is refused for everyone.
  "POST /api/unsubscribe": {
    request: () => ({ query: "token=djE6Zm9yZ2Vk.AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA", body: {} }),
    expect: { signedOut: 400, chief: 400, instructor: 400, student: 400, sponsor: 400 },
  },
  // Public by design (the one-time token is the credential): an unknown token changes nothing.
  "action app/(public)/set-password/[token]/actions.ts#setPasswordAction": {
    request: () => ({
      params: { token: "x".repeat(43) },
      args: [{ token: "x".repeat(43), password: "a-long-enough-password", confirm: "a-long-enough-password" }],
    }),
    expect: { signedOut: 400, chief: 400, instructor: 400, student: 400, sponsor: 400 },
  },
  "action app/(app)/settings/actions.ts#saveSchoolSettingsAction": {
    // the seeded values, so the positive call changes nothing other tests rely on
    request: () => ({
      args: [
        {
          mailSenderName: "Larkhollow Flying School",
          reminderLeadHours: 24,
          weeklyLetterDay: 5,
          checkValidityDays: 60,
          stageCheckPassMarkPercent: 80,
          lateEntryDays: 7,
          authority: "Larkhollow regional training standard (fictional)",
        },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(res.json).toMatchObject({ ok: true, data: { saved: true } }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },
  "action app/(app)/mail/actions.ts#retryMailAction": {
    // no failed mail with this id in the chief's school: 404 after the permission check
    request: () => ({ args: [{ outboxId: "00000000-0000-4000-8000-000000000000" }] }),
    expect: { signedOut: 401, chief: 404, instructor: 403, student: 403, sponsor: 403 },
  },
  "action app/(app)/mail/actions.ts#addSponsorNoteAction": {
    // the chief writes about the sponsored student; the Kestrel lead may not write about a Merlin student
    request: (fx, caller) => ({
      args: [{ studentId: caller === "instructor" ? fx.otherStudent : fx.student, body: "Harness note for the sponsor." }],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(res.json).toMatchObject({ ok: true }) },
      instructor: 404,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
    secrets: (fx) => [fx.otherStudent],
  },
};
