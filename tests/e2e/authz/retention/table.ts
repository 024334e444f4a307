// Retention: rows of the authorisation table. Only the chief may act; the chief's calls that would
// change the demo's records are refused on their merits (an unknown hold or student is 404, a
// student in training cannot be archived: 422), so the seeded record past its retention date stays
// listed for the crawler. Saving the rules writes the defaults (what the demo uses).
import type { AuthzTable, HarnessResponse } from "../types";

const failure = (res: HarnessResponse) => res.json as { ok: boolean; message?: string; field?: string };
const MISSING = "00000000-0000-4000-8000-000000000000";

export const RETENTION_TABLE: AuthzTable = {
  "action app/(app)/retention/actions.ts#saveRetentionSettingsAction": {
    request: () => ({ args: [{ schoolRecords: true, instructorRecords: true, easaAto: false }] }),
    expect: { signedOut: 401, chief: 200, instructor: 403, student: 403, sponsor: 403 },
    mutates: true,
  },
  "action app/(app)/retention/actions.ts#setLegalHoldAction": {
    request: () => ({ args: [{ studentId: MISSING, reason: "Harness: a hold on nobody" }] }),
    expect: { signedOut: 401, chief: 404, instructor: 403, student: 403, sponsor: 403 },
  },
  "action app/(app)/retention/actions.ts#liftLegalHoldAction": {
    request: () => ({ args: [{ holdId: MISSING, reason: "Harness: no such hold" }] }),
    expect: { signedOut: 401, chief: 404, instructor: 403, student: 403, sponsor: 403 },
  },
  "action app/(app)/retention/actions.ts#archiveRecordAction": {
    request: (fx) => ({ args: [{ studentId: fx.student }] }),
    expect: {
      signedOut: 401,
      chief: {
        status: 422,
        check: (res) => {
          expect(failure(res).field).toBe("studentId");
          expect(failure(res).message).toMatch(/still in training/);
        },
      },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    secrets: (fx) => [fx.student],
  },
};
