// End of training: the chief's End of training screen (ending training, leaving a cohort) and the graduation certificate.
import type { AuthzTable, HarnessResponse } from "../types";

const result = (res: HarnessResponse) => res.json as { ok: boolean; status?: number; field?: string; message?: string };

export const COMPLETION_TABLE: AuthzTable = {
  "action app/(app)/completion/actions.ts#endTrainingAction": {
    // the chief passes the permission and the password re-entry, and the graduation of the demo student
    // (items not yet signed off) is refused naming kind: nothing is written, the demo record stays as it is
    request: (fx) => ({
      args: [
        {
          studentId: fx.student,
          kind: "graduated",
          endedOn: new Date().toISOString().slice(0, 10), // UTC date: never later than the school's (Europe/London) today
          reason: "completed the course",
          statement: "I certify that this training record is true and complete as kept by the school.",
          password: "chalkwing-demo",
        },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: {
        status: 409,
        check: (res) => {
          expect(result(res)).toMatchObject({ ok: false, field: "kind" });
          expect(result(res).message).toMatch(/items not signed off/);
        },
      },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    secrets: (fx) => [fx.student],
  },

  "action app/(app)/completion/actions.ts#withdrawFromCohortAction": {
    // a date before the demo student's membership began: the chief's call is a 409 naming leftOn, nothing written
    request: (fx) => ({ args: [{ studentId: fx.student, leftOn: "2001-01-02", reason: "harness check" }] }),
    expect: {
      signedOut: 401,
      chief: { status: 409, check: (res) => expect(result(res)).toMatchObject({ ok: false, field: "leftOn" }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    secrets: (fx) => [fx.student],
  },

  "GET /api/records/[studentId]/certificate": {
    request: (fx) => ({ params: { studentId: fx.graduate! } }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(res.headers.get("content-type")).toBe("application/pdf") },
      // the graduate has no cohort: only the chief keeps her record; other students and sponsors see nothing
      instructor: 404,
      student: 404,
      sponsor: 404,
    },
    secrets: () => ["Ines Varga"],
  },
};
