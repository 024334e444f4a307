// End of training: the graduation certificate.
import type { AuthzTable } from "../types";

export const COMPLETION_TABLE: AuthzTable = {
  // endTrainingAction has no screen yet, so no page carries it and the build lists no endpoint for it;
  // its permission and refusals are tested in tests/integration/completion/end-of-training.test.ts.
  // Add its row here when a page uses it (the harness then fails until the row exists).

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
