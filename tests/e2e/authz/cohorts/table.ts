// The Cohorts page's rows of the authorisation table: only the chief (cohorts.manage) creates,
// renames and closes cohorts and dates memberships. The chief's calls touch only cohorts the
// harness makes itself (named per call), so the seeded cohorts and memberships stay as they are.
import type { AuthzTable, HarnessResponse } from "../types";

const result = (res: HarnessResponse) => res.json as { ok: boolean; status?: number; data?: Record<string, unknown> };
const NO_SUCH = "00000000-0000-4000-8000-000000000000";
const refused = { signedOut: 401, instructor: 403, student: 403, sponsor: 403 } as const;

export const COHORTS_TABLE: AuthzTable = {
  "action app/(app)/cohorts/actions.ts#createCohortAction": {
    request: (fx, caller) => ({
      args: [
        {
          name: `Harness cohort ${caller}`,
          courseId: fx.course,
          leadInstructorId: fx.instructor,
          startsOn: "2027-01-04",
          idempotencyKey: `harness-cohort-${caller}`,
        },
      ],
    }),
    expect: {
      ...refused,
      chief: { status: 200, check: (res) => expect(result(res).data).toMatchObject({ name: "Harness cohort chief" }) },
    },
    mutates: true,
  },
  "action app/(app)/cohorts/actions.ts#renameCohortAction": {
    // the Kestrel cohort keeps its name: the chief's call renames it to the same name
    request: (fx) => ({ args: [{ cohortId: fx.kestrelCohort, name: "Kestrel cohort" }] }),
    expect: {
      ...refused,
      chief: { status: 200, check: (res, fx) => expect(result(res).data).toEqual({ id: fx.kestrelCohort, name: "Kestrel cohort" }) },
    },
    mutates: true,
  },
  "action app/(app)/cohorts/actions.ts#closeCohortAction": {
    // the Kestrel cohort has students, so even the chief's close is refused (409 naming closedOn): nothing changes
    request: (fx) => ({ args: [{ cohortId: fx.kestrelCohort, closedOn: "2027-12-31" }] }),
    expect: { ...refused, chief: { status: 409, check: (res) => expect(result(res)).toMatchObject({ ok: false, field: "closedOn" }) } },
  },
  "action app/(app)/cohorts/actions.ts#addMemberAction": {
    // the demo student already belongs to Kestrel: the chief's add is a 400 naming fromDate, nothing written
    request: (fx) => ({
      args: [{ cohortId: fx.merlinCohort, studentId: fx.student, fromDate: "2027-12-01", idempotencyKey: "harness-add-member" }],
    }),
    expect: { ...refused, chief: { status: 400, check: (res) => expect(result(res)).toMatchObject({ ok: false, field: "fromDate" }) } },
    secrets: (fx) => [fx.student],
  },
  "action app/(app)/cohorts/actions.ts#moveMemberAction": {
    // a cohort of nowhere: the chief passes the permission check and gets a 404 naming toCohortId
    request: (fx) => ({
      args: [{ studentId: fx.student, toCohortId: NO_SUCH, onDate: "2027-12-01", idempotencyKey: "harness-move-member" }],
    }),
    expect: { ...refused, chief: { status: 404, check: (res) => expect(result(res)).toMatchObject({ ok: false, field: "toCohortId" }) } },
    secrets: (fx) => [fx.student],
  },
};
