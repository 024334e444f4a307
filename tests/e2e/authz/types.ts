// The authorisation table's shape. Every endpoint derived from the code (each exported method of
// every app/**/route.ts and every exported server action) must have an entry, or the harness fails.
//
// Keys:
//   route handlers:  "GET /api/today", "POST /api/briefings/[briefingId]/handouts" (the app-dir path)
//   server actions:  "action app/(app)/today/actions.ts#unlockAccountAction"
// An action's answer is mapped to a status: `{ ok: true }` → 200, `{ ok: false, status }` → that status.
// A redirect to /sign-in (proxy.ts, for signed-out callers of actions on signed-in pages) counts as 401.

export type Caller = "signedOut" | "chief" | "instructor" | "student" | "sponsor";
export const CALLERS: Caller[] = ["signedOut", "chief", "instructor", "student", "sponsor"];

export interface HarnessResponse {
  status: number;
  /** parsed JSON for JSON answers and for action results; otherwise undefined */
  json: unknown;
  text: string;
  headers: Headers;
}

/**
 * Ids looked up from the seeded end-to-end database (see fixtures.ts); areas add what they need.
 * The foundation's names are typed as `string`; an area's own names may be added here too
 * (one line each), otherwise they read as `string | undefined`. Unknown names throw at run time.
 */
export interface Fixtures {
  [name: string]: string;
  school: string;
  chief: string;
  instructor: string;
  otherInstructor: string;
  student: string;
  cohortmate: string;
  otherStudent: string;
  sponsor: string;
  kestrelCohort: string;
  merlinCohort: string;
  course: string;
  syllabusRevision: string;
  lockedPerson: string;
  lockedPerson2: string;
  // briefings, handouts, assignments, syllabus revisions (authz/briefings/fixtures.ts)
  briefingVmd: string;
  briefingSources: string;
  handoutVmd: string;
  assignmentVmdKestrel: string;
  studentEnrolment: string;
  harnessCourse: string;
}

export interface EndpointRequest {
  /** values for the dynamic segments, e.g. { briefingId: fx.briefing } */
  params?: Record<string, string>;
  /** query string without "?" */
  query?: string;
  /** JSON body for route handlers */
  body?: unknown;
  /** raw body (uploads); with contentType */
  rawBody?: Buffer | string;
  contentType?: string;
  /** the arguments of a server action */
  args?: unknown[];
}

export type Expect = number | { status: number; check?: (res: HarnessResponse, fx: Fixtures) => void | Promise<void> };

export interface EndpointCase {
  /** what to send; called afresh for every caller */
  request?: (fx: Fixtures, caller: Caller) => EndpointRequest;
  expect: Record<Caller, Expect>;
  /** a successful call changes rows by design (positive cells are not checked for "no rows changed") */
  mutates?: boolean;
  /** identifiers/strings that a refused call must never echo back (target's name, e-mail, ids) */
  secrets?: (fx: Fixtures) => string[];
}

/** An endpoint the harness deliberately does not call, with a one-line reason (tested elsewhere). */
export interface SkippedEndpoint {
  skip: string;
}

/** The table: every derived endpoint key maps to a case or a skip. */
export type AuthzTable = Record<string, EndpointCase | SkippedEndpoint>;
