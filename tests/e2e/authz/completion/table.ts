// End of training: the chief ends and certifies a student's training; the graduation certificate.
// The allowed call asks to graduate the demo student, who has not completed the course: the chief
// passes the permission check and is refused (409) by the rule, so the harness changes nothing.
import type { AuthzTable } from "../types";

export const COMPLETION_TABLE: AuthzTable = {
  "action app/(app)/completion/actions.ts#endTrainingAction": {
    request: (fx) => ({
      args: [
        {
          studentId: fx.student,
          kind: "graduated",
          endedOn: new Date().toISOString().slice(0, 10),
          reason: "harness",
          statement: "I certify that this training record is true and complete.",
          password: "chalkwing-demo",
        },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 409, check: (res) => expect((res.json as { message: string }).message).toMatch(/not signed off/) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
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
