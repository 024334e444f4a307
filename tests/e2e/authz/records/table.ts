// The Records area's rows of the authorisation table: oral checks, sign-offs, stage checks,
// the Sign-off register and its CSV, the audit chain, the Progress map and the training record.
// Mutating cells each have their own target (records/fixtures.ts). "Another student's record by
// id" is asked by the student and the sponsor in the Progress map row: 404 with nothing leaked.
import type { AuthzTable, Caller, Fixtures, HarnessResponse } from "../types";

const result = (res: HarnessResponse) => res.json as { ok: boolean; status?: number; message?: string; data?: Record<string, unknown> };
const okData = (res: HarnessResponse) => {
  expect(result(res).ok).toBe(true);
  return result(res).data!;
};
const PASSWORD = "chalkwing-demo";
const at = () => new Date(Date.now() - 10 * 60_000).toISOString();

const checkArgs = (fx: Fixtures) => ({
  studentId: fx.recordsCallum,
  itemIds: [fx.recordsItemAer01],
  levelShown: "understanding",
  durationMinutes: 8,
  occurredAt: at(),
  remarks: "harness",
  questions: [
    {
      syllabusItemId: fx.recordsItemAer01,
      questionText: "Name the parts of zero-lift drag.",
      answerSummary: "all three",
      outcome: "solid",
      required: true,
      prompted: false,
      correctiveGiven: false,
    },
  ],
});

const byCaller = <T>(caller: Caller, chief: T, instructor: T, other: T) =>
  caller === "chief" ? chief : caller === "instructor" ? instructor : other;

export const RECORDS_TABLE: AuthzTable = {
  "action app/(app)/records/actions.ts#recordCheckAction": {
    request: (fx) => ({ args: [checkArgs(fx)] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(okData(res).outcome).toBe("meets") },
      instructor: { status: 200, check: (res) => expect(okData(res).outcome).toBe("meets") },
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/records/actions.ts#amendCheckAction": {
    // the chief amends Noor's first check (any instructor's), her lead his own latest one
    request: (fx, caller) => ({
      args: [
        {
          ...checkArgs(fx),
          studentId: fx.recordsNoor,
          itemIds: [fx.recordsItemAer02],
          questions: [{ ...checkArgs(fx).questions[0]!, syllabusItemId: fx.recordsItemAer02, questionText: "What does mass do to it?" }],
          amends: {
            checkId: byCaller(caller, fx.recordsCheckToAmendByChief, fx.recordsCheckToAmendByLead, fx.recordsCheckToAmendByLead),
            reason: "harness amendment",
          },
          password: PASSWORD,
        },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(okData(res).outcome).toBe("meets") },
      instructor: { status: 200, check: (res) => expect(okData(res).outcome).toBe("meets") },
      student: 403,
      sponsor: 403,
    },
    mutates: true,
    secrets: (fx) => [fx.recordsNoor!, "Noor Brandt"],
  },

  "action app/(app)/register/actions.ts#reviewWatchNoteAction": {
    // the late-entry note of Elin's first check
    request: (fx) => ({
      args: [{ recordType: "oral_check", recordId: fx.recordsCheckToWithdrawByLead, kind: "late_entry", remark: "harness review" }],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(okData(res).id).toMatch(/^[0-9a-f-]{36}$/) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/records/actions.ts#withdrawCheckAction": {
    request: (fx, caller) => ({
      args: [
        {
          checkId: byCaller(caller, fx.recordsCheckToWithdrawByChief, fx.recordsCheckToWithdrawByLead, fx.recordsCheckToWithdrawByLead),
          reason: "harness withdrawal",
          password: PASSWORD,
        },
      ],
    }),
    expect: { signedOut: 401, chief: 200, instructor: 200, student: 403, sponsor: 403 },
    mutates: true,
  },

  "action app/(app)/records/actions.ts#signOffAction": {
    request: (fx, caller) => ({
      args: [
        {
          studentId: byCaller(caller, fx.recordsBeatriz, fx.recordsSaoirse, fx.recordsSaoirse),
          itemId: fx.recordsItemAer01,
          password: PASSWORD,
        },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(okData(res)).toMatchObject({ itemCode: "AER-01", generation: 1 }) },
      instructor: { status: 200, check: (res) => expect(okData(res).signatureHash).toMatch(/^[0-9a-f]{64}$/) },
      student: 403,
      sponsor: 403,
    },
    mutates: true,
    secrets: (fx) => [fx.recordsSaoirse!, "Saoirse Dunleavy"],
  },

  "action app/(app)/records/actions.ts#withdrawSignOffAction": {
    request: (fx, caller) => ({
      args: [
        {
          signOffId: byCaller(
            caller,
            fx.recordsSignOffToWithdrawByChief,
            fx.recordsSignOffToWithdrawByLead,
            fx.recordsSignOffToWithdrawByLead,
          ),
          reason: "harness withdrawal",
          password: PASSWORD,
        },
      ],
    }),
    expect: { signedOut: 401, chief: 200, instructor: 200, student: 403, sponsor: 403 },
    mutates: true,
  },

  "action app/(app)/records/actions.ts#amendSignOffAction": {
    request: (fx, caller) => ({
      args: [
        {
          signOffId: byCaller(caller, fx.recordsSignOffToAmendByChief, fx.recordsSignOffToAmendByLead, fx.recordsSignOffToAmendByLead),
          reason: "harness amendment",
          password: PASSWORD,
        },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(okData(res).generation).toBe(2) },
      instructor: { status: 200, check: (res) => expect(okData(res).generation).toBe(2) },
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/records/actions.ts#conductStageCheckAction": {
    request: (fx) => ({
      args: [
        {
          studentId: fx.recordsReadyStudent,
          stageId: fx.recordsStageAer,
          result: "pass",
          // the examiner chooses an oral outcome for every item of the stage
          oralOutcomes: [fx.recordsItemAer01, fx.recordsItemAer02, fx.recordsItemAer03, fx.recordsItemAer04, fx.recordsItemAer05].map(
            (itemId) => ({ itemId, outcome: "solid" }),
          ),
          writtenScorePercent: 88,
          remarks: "harness",
          occurredAt: at(),
          password: PASSWORD,
        },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(okData(res)).toMatchObject({ result: "pass", attempt: 1 }) },
      // the Kestrel lead is not a designated check instructor (and leads this student)
      instructor: {
        status: 422,
        check: (res) => expect(result(res)).toMatchObject({ field: "examiner", message: expect.stringMatching(/^Examiner: /) }),
      },
      student: 403,
      sponsor: 403,
    },
    mutates: true,
    secrets: (fx) => [fx.recordsReadyStudent!, "Mateo Ferreira"],
  },

  "action app/(app)/records/actions.ts#designateCheckInstructorAction": {
    request: (fx) => ({ args: [{ personId: fx.otherInstructor, checkInstructor: true }] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(okData(res).checkInstructor).toBe(true) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/progress/actions.ts#acknowledgeCheckAction": {
    request: (fx) => ({ args: [{ checkId: fx.recordsAdaCheck }] }),
    expect: {
      signedOut: 401,
      chief: 403,
      instructor: 403,
      student: { status: 200, check: (res) => expect(okData(res).acknowledged).toBe(true) },
      sponsor: 403,
    },
    mutates: true,
  },

  "GET /api/progress/[studentId]": {
    // staff ask for Ada (their student); the student and the sponsor ask for Noor, another student: 404, nothing leaked
    request: (fx, caller) => ({ params: { studentId: caller === "student" || caller === "sponsor" ? fx.cohortmate : fx.student } }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res, fx) => expect((res.json as { student: { id: string } }).student.id).toBe(fx.student) },
      instructor: {
        status: 200,
        check: (res) => {
          const j = res.json as { access: string; stages: { items: unknown[] }[] };
          expect(j.access).toBe("staff");
          expect(j.stages.length).toBeGreaterThan(0);
        },
      },
      student: 404,
      sponsor: 404,
    },
    secrets: (fx) => [fx.cohortmate, "Noor Brandt", "noor.brandt@chalkwing.test"],
  },

  "GET /api/records/[studentId]/training-record": {
    // the sponsor may see a shared Progress map, but not the training record
    request: (fx) => ({ params: { studentId: fx.student } }),
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res) => {
          expect(res.headers.get("content-type")).toBe("application/pdf");
          expect(res.text.startsWith("%PDF-")).toBe(true);
        },
      },
      instructor: 200,
      student: { status: 200, check: (res) => expect(res.headers.get("x-audit-head")).toMatch(/^[0-9a-f]{64}$/) },
      sponsor: 404,
    },
    secrets: () => ["student@chalkwing.test"],
  },

  "GET /api/register/export": {
    request: () => ({ query: "from=2000-01-01" }),
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res) => {
          expect(res.headers.get("content-type")).toContain("text/csv");
          expect(res.text).toContain("audit chain head hash");
          expect(res.text).toContain("Kofi Mensah");
        },
      },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
  },

  "GET /api/register/verify": {
    // the checkpoint verification (never a walk of the whole chain) and the latest full walk
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res) => {
          expect(res.json).toMatchObject({ ok: true, broken: null });
          expect(res.json).toHaveProperty("latestWalk");
          expect(res.headers.get("cache-control")).toContain("no-store");
        },
      },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
  },

  "GET /api/register/walks/latest": {
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res) => {
          expect(res.json).toHaveProperty("walk");
          expect(res.headers.get("cache-control")).toContain("no-store");
        },
      },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
  },

  "action app/(app)/register/chain/actions.ts#startWalkAction": {
    request: () => ({ args: [{}] }),
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res) => {
          const walk = (okData(res) as { walk: { state: string; total: number } }).walk;
          expect(["queued", "running", "ok"]).toContain(walk.state);
          expect(walk.total).toBeGreaterThan(0);
        },
      },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },
};
