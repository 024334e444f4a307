// The search pickers' rows of the authorisation table (GET /api/directory/*): staff only; each
// purpose asks the permission of the form that uses it; students come through the caller's
// student scope (the instructor leads Kestrel, so Merlin's Lotte Lindqvist stays out of their answer).
import type { AuthzTable, HarnessResponse } from "../types";

const rows = (res: HarnessResponse) => (res.json as { rows: { id: string; name: string }[] }).rows;

export const DIRECTORY_TABLE: AuthzTable = {
  "GET /api/directory/students": {
    // "q" is in both Ada Quill's and Lotte Lindqvist's names and in few others: an empty q lists the
    // first 20 by name, and students other tests add before the harness could push Lotte out of them.
    request: () => ({ query: "purpose=schedule&q=q" }),
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res, fx) => {
          expect(rows(res).length).toBeLessThanOrEqual(20);
          expect(rows(res).map((r) => r.id)).toEqual(expect.arrayContaining([fx.student, fx.otherStudent]));
        },
      },
      instructor: {
        status: 200,
        check: (res, fx) => {
          const ids = rows(res).map((r) => r.id);
          expect(ids).toContain(fx.student);
          expect(ids).not.toContain(fx.otherStudent);
        },
      },
      student: 403,
      sponsor: 403,
    },
    secrets: (fx) => [fx.otherStudent, "Lotte Lindqvist"],
  },
  "GET /api/directory/cohorts": {
    request: () => ({ query: "purpose=timetable&q=cohort" }),
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res, fx) => expect(rows(res).map((r) => r.id)).toEqual(expect.arrayContaining([fx.kestrelCohort, fx.merlinCohort])),
      },
      instructor: { status: 200, check: (res, fx) => expect(rows(res).map((r) => r.id)).toContain(fx.kestrelCohort) },
      student: 403,
      sponsor: 403,
    },
    secrets: (fx) => [fx.merlinCohort],
  },
  "GET /api/directory/instructors": {
    request: () => ({ query: "purpose=timetable&q=" }),
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res, fx) => expect(rows(res).map((r) => r.id)).toEqual(expect.arrayContaining([fx.instructor, fx.otherInstructor])),
      },
      instructor: { status: 200, check: (res, fx) => expect(rows(res).map((r) => r.id)).not.toContain(fx.student) },
      student: 403,
      sponsor: 403,
    },
    secrets: (fx) => [fx.otherInstructor],
  },
  "GET /api/directory/endorsements": {
    // the demo school's endorsements: whatever awaits a result is within the caller's reach (an instructor: their own)
    request: () => ({ query: "kind=awaiting&q=" }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(Array.isArray(rows(res))).toBe(true) },
      instructor: { status: 200, check: (res) => expect(Array.isArray(rows(res))).toBe(true) },
      student: 403,
      sponsor: 403,
    },
  },
  "GET /api/directory/people": {
    request: () => ({ query: "role=sponsor&q=sponsor" }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res, fx) => expect(rows(res).map((r) => r.id)).toContain(fx.sponsor) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    secrets: (fx) => [fx.lockedPerson],
  },
};
