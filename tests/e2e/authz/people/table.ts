// The People area's rows of the authorisation table: instructor files (qualifications with history),
// account changes, invitations and roles.
import type { AuthzTable, HarnessResponse } from "../types";

const result = (res: HarnessResponse) => res.json as { ok: boolean; status?: number; data?: Record<string, unknown> };

export const PEOPLE_TABLE: AuthzTable = {
  "action app/(app)/people/actions.ts#saveQualificationAction": {
    // a second qualification for the Kestrel lead: only the chief may add it
    request: (fx, caller) => ({
      args: [
        {
          personId: fx.instructor,
          certificateKind: "Ground instructor (advanced)",
          certificateNumber: `HARNESS-${caller.toUpperCase()}`,
          ratings: "Principles of flight",
          courseIds: [fx.course],
          checkInstructor: false,
          issuedOn: "2020-01-01",
          recencyOn: "2020-01-01",
          recencyMonths: 24,
          effectiveFrom: "2020-01-01",
          changeNote: "",
        },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res) => {
          expect(result(res).ok).toBe(true);
          expect(result(res).data).toMatchObject({ version: 1 });
        },
      },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/people/actions.ts#setAccountActiveAction": {
    // the chief reactivates an account that is already active: its sessions end (version bump), nothing else changes
    request: (fx) => ({ args: [{ personId: fx.lockedPerson2, active: true }] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res, fx) => expect(result(res).data).toEqual({ id: fx.lockedPerson2, active: true }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
    secrets: (fx) => [fx.lockedPerson2],
  },

  "action app/(app)/people/actions.ts#linkSponsorAction": {
    // the demo sponsor is already linked to the demo student: the chief's call is a 409 naming studentId, nothing written
    request: (fx) => ({ args: [{ sponsorId: fx.sponsor, studentId: fx.student, idempotencyKey: "harness-link-sponsor" }] }),
    expect: {
      signedOut: 401,
      chief: { status: 409, check: (res) => expect(result(res)).toMatchObject({ ok: false, field: "studentId" }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    secrets: (fx) => [fx.student],
  },
  "action app/(app)/people/accounts/actions.ts#invitePersonAction": {
    // an e-mail that already has an account: the chief's call is a 409 naming email, no account or mail is written
    request: (fx, caller) => ({
      args: [
        { name: "Harness Invitee", email: "instructor@chalkwing.test", roles: ["instructor"], idempotencyKey: `harness-invite-${caller}` },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 409, check: (res) => expect(result(res)).toMatchObject({ ok: false, field: "email" }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
  },

  "action app/(app)/people/accounts/actions.ts#changeRolesAction": {
    // the demo school's only chief instructor gives up her own chief role: refused (409 naming roles), nothing changes
    request: (fx) => ({ args: [{ personId: fx.chief, roles: ["instructor"] }] }),
    expect: {
      signedOut: 401,
      chief: {
        status: 409,
        check: (res) => {
          expect(result(res)).toMatchObject({ ok: false, field: "roles" });
          expect((res.json as { message: string }).message).toMatch(/last chief instructor/);
        },
      },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
  },
};
