// The briefings', handouts', assignments' and syllabus revisions' rows of the authorisation table.
import type { AuthzTable, HarnessResponse, Fixtures } from "../types";

const ok = (res: HarnessResponse) => res.json as { ok: boolean; data?: Record<string, unknown> };
const listIds = (res: HarnessResponse) => (res.json as { rows: { id: string }[] }).rows.map((r) => r.id);

/** A valid 1×1 grey PNG: signature, IHDR, IDAT, IEND, each chunk with its CRC (RFC 2083). */
export const TINY_PNG = Buffer.from(
  "89504e470d0a1a0a0000000d49484452000000010000000108000000003a7e9b55" +
    "0000000a49444154789c636800000082008177cd72b60000000049454e44ae426082",
  "hex",
);

const draft = (fx: Fixtures, title: string) => ({
  courseId: fx.course,
  syllabusRevisionId: fx.syllabusRevision,
  title,
  objective: "Check who may write briefings.",
  syllabusItemIds: [],
  elements: [{ title: "One element", instructorActions: "Explain.", studentActions: "Listen.", minutes: 5 }],
  equipment: "",
  demoRevisionIds: [],
  completionStandard: "None; harness data.",
  handoutIds: [],
  changeNote: "harness",
});

export const BRIEFINGS_TABLE: AuthzTable = {
  "GET /api/briefings": {
    request: () => ({ query: "sort=title&dir=asc&pageSize=100" }),
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res, fx) => expect(listIds(res)).toEqual(expect.arrayContaining([fx.briefingVmd, fx.briefingSources])),
      },
      instructor: { status: 200, check: (res, fx) => expect(listIds(res)).toContain(fx.briefingVmd) },
      // the Kestrel student: the Vmd briefing is assigned to their cohort
      student: { status: 200, check: (res, fx) => expect(listIds(res)).toContain(fx.briefingVmd) },
      sponsor: 403,
    },
    secrets: (fx) => [fx.briefingVmd, "The drag curve and Vmd"],
  },

  "POST /api/briefings/[briefingId]/handouts": {
    request: (fx) => ({
      params: { briefingId: fx.briefingSources },
      query: "name=harness-dot.png",
      rawBody: TINY_PNG,
      contentType: "image/png",
    }),
    expect: {
      signedOut: 401,
      chief: {
        status: 201,
        check: (res) => expect(res.json).toMatchObject({ handoutId: expect.any(String), revisionNumber: expect.any(Number) }),
      },
      instructor: { status: 201, check: (res) => expect(res.json).toMatchObject({ handoutId: expect.any(String) }) },
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "GET /api/handouts/[handoutId]": {
    request: (fx) => ({ params: { handoutId: fx.handoutVmd } }),
    expect: {
      signedOut: 401,
      chief: 200,
      instructor: 200,
      // a student of the cohort the briefing is assigned to downloads it
      student: {
        status: 200,
        check: (res) => {
          expect(res.headers.get("content-type")).toBe("application/pdf");
          expect(res.headers.get("x-content-type-options")).toBe("nosniff");
          expect(res.headers.get("content-disposition")).toBe(
            `attachment; filename="drag-curve-and-vmd.pdf"; filename*=UTF-8''drag-curve-and-vmd.pdf`,
          );
          expect(res.text.startsWith("%PDF-")).toBe(true);
        },
      },
      sponsor: 403,
    },
    secrets: () => ["drag-curve-and-vmd.pdf"],
  },

  "action app/(app)/briefings/actions.ts#createBriefingAction": {
    request: (fx, caller) => ({ args: [draft(fx, `Harness briefing by ${caller}`)] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(ok(res).data).toMatchObject({ number: 1, created: true }) },
      instructor: { status: 200, check: (res) => expect(ok(res).data).toMatchObject({ number: 1, created: true }) },
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/briefings/actions.ts#reviseBriefingAction": {
    request: (fx, caller) => ({
      args: [
        {
          ...draft(fx, "Where drag comes from"),
          briefingId: fx.briefingSources,
          objective: `Name the parts of drag (harness revision by ${caller}).`,
        },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res, fx) => expect(ok(res).data).toMatchObject({ briefingId: fx.briefingSources, created: true }) },
      instructor: {
        status: 200,
        check: (res, fx) => expect(ok(res).data).toMatchObject({ briefingId: fx.briefingSources, created: true }),
      },
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/assignments/actions.ts#createAssignmentAction": {
    request: (fx) => ({
      args: [
        {
          kind: "briefing",
          briefingId: fx.briefingSources,
          cohortId: fx.kestrelCohort,
          studentIds: [],
          dueOn: "2099-06-30",
          note: "harness",
        },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(ok(res).data).toMatchObject({ ids: [expect.any(String)] }) },
      // the instructor leads the Kestrel cohort
      instructor: { status: 200, check: (res) => expect(ok(res).data).toMatchObject({ ids: [expect.any(String)] }) },
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/assignments/actions.ts#setAssignmentDoneAction": {
    request: (fx) => ({ args: [{ assignmentId: fx.assignmentVmdKestrel, done: true }] }),
    expect: {
      signedOut: 401,
      chief: 403,
      instructor: 403,
      student: { status: 200, check: (res) => expect(ok(res).data).toEqual({ done: true }) },
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/syllabus/actions.ts#createSyllabusRevisionAction": {
    request: (fx) => ({
      args: [
        {
          courseId: fx.harnessCourse,
          approvedOn: null,
          effectiveFrom: null,
          changeNote: "harness",
          stages: [
            {
              code: "H",
              title: "Harness stage",
              items: [{ code: "H-01", title: "Item", objective: "None.", completionStandard: "None.", requiredLevel: "rote" }],
            },
          ],
        },
      ],
    }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(ok(res).data).toMatchObject({ number: expect.any(Number) }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/syllabus/actions.ts#moveEnrolmentAction": {
    // moving the student to the revision they are on: allowed, and changes nothing
    request: (fx) => ({ args: [{ enrolmentId: fx.studentEnrolment, revisionId: fx.syllabusRevision }] }),
    expect: {
      signedOut: 401,
      chief: { status: 200, check: (res) => expect(ok(res).data).toMatchObject({ moved: false }) },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    secrets: (fx) => [fx.studentEnrolment],
  },
};
