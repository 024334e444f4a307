// Knowledge-test endorsements' rows of the authorisation table. The seeded Kestrel student has
// unsigned items, so an allowed endorsement is refused on its preconditions (422) and writes
// nothing; results and remedial items of an unknown id are 404; only the chief saves the settings
// (with the values the demo seed writes, so other tests see the same settings).
import type { AuthzTable, HarnessResponse } from "../types";

const failure = (res: HarnessResponse) => res.json as { ok: boolean; message?: string };
const MISSING = "00000000-0000-4000-8000-000000000000";

export const ENDORSEMENTS_TABLE: AuthzTable = {
  "action app/(app)/endorsements/actions.ts#endorseAction": {
    request: (fx) => ({ args: [{ studentId: fx.student, password: "not-the-password" }] }),
    expect: {
      signedOut: 401,
      chief: { status: 422, check: (res) => expect(failure(res).message).toMatch(/items not signed off/) },
      instructor: { status: 422, check: (res) => expect(failure(res).message).toMatch(/items not signed off/) },
      student: 403,
      sponsor: 403,
    },
  },
  "action app/(app)/endorsements/actions.ts#recordResultAction": {
    request: () => ({ args: [{ endorsementId: MISSING, takenOn: "2026-01-05", scorePercent: 80, areasMissed: [] }] }),
    expect: { signedOut: 401, chief: 404, instructor: 404, student: 403, sponsor: 403 },
  },
  "action app/(app)/endorsements/actions.ts#completeRemedialAction": {
    request: () => ({ args: [{ remedialId: MISSING, note: "reviewed the area" }] }),
    expect: { signedOut: 401, chief: 404, instructor: 404, student: 403, sponsor: 403 },
  },
  "action app/(app)/endorsements/actions.ts#saveAuthoritySettingsAction": {
    request: () => ({
      args: [
        {
          authorityName: "Larkhollow demo authority (Part 141 style)",
          endorsementWording:
            "I have given {student} the ground training required for the {course} knowledge test and find the student prepared for it.",
          passMarkPercent: 70,
          resultValidityMonths: 24,
          attemptLimit: 3,
        },
      ],
    }),
    expect: { signedOut: 401, chief: 200, instructor: 403, student: 403, sponsor: 403 },
    mutates: true,
  },
};
