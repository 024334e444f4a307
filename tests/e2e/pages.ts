// The pages the accessibility crawler (a11y.test.ts) visits, for each role allowed.
// How to add a page: one entry with a stable `name` (used in screenshot file names), the path
// (a function of the fixtures for pages with ids, e.g. (fx) => `/briefings/${fx.briefing}`), the
// callers who may open it, and `waitFor`: a selector that appears once the page's data is shown.
// `status` is the expected HTTP status of the document (default 200), for the 403 and 404 pages.
import type { Caller, Fixtures } from "./authz/types";

export interface CrawlPage {
  name: string;
  path: string | ((fx: Fixtures) => string);
  roles: Caller[];
  waitFor?: string;
  status?: number;
}

export const PAGES: CrawlPage[] = [
  // ---- foundation ----
  { name: "today", path: "/today", roles: ["chief", "instructor", "student", "sponsor"], waitFor: "main h1" },
  { name: "people", path: "/people", roles: ["chief", "instructor"], waitFor: "main h1" },
  // a later page of everyone, filtered (the page links keep the filter)
  { name: "people-everyone-page-2", path: "/people?role=student&page=2", roles: ["chief"], waitFor: "[data-testid=people-pages]" },
  {
    name: "people-instructor-file",
    path: (fx) => `/people/${fx.instructor}`,
    roles: ["chief"],
    waitFor: "[data-testid=qualification-history] tbody tr",
  },
  { name: "people-instructor-file-forbidden", path: (fx) => `/people/${fx.instructor}`, roles: ["instructor"], waitFor: "h1", status: 403 },
  { name: "syllabus", path: "/syllabus", roles: ["chief", "instructor", "student"], waitFor: "main h1" },
  { name: "sign-in", path: "/sign-in", roles: ["signedOut"], waitFor: "form" },
  { name: "forbidden", path: "/people", roles: ["student"], waitFor: "h1", status: 403 },
  { name: "not-found", path: "/no-such-page", roles: ["student"], waitFor: "h1", status: 404 },

  // ---- other areas: add your pages below ----
  // ---- practice questions (issue 14) ----
  { name: "practice", path: "/practice", roles: ["student"], waitFor: "[data-testid=practice-test]" },
  { name: "practice-forbidden", path: "/practice", roles: ["instructor", "sponsor"], waitFor: "h1", status: 403 },
  // ---- Curve Lab ----
  { name: "curve-lab", path: "/curve-lab", roles: ["chief", "instructor", "student"], waitFor: "[data-testid=demo-list] tbody tr" },
  { name: "curve-lab-forbidden", path: "/curve-lab", roles: ["sponsor"], waitFor: "h1", status: 403 },
  {
    name: "curve-lab-demo",
    path: (fx) => `/curve-lab/demos/${fx.curveLabBucketDemo}`,
    roles: ["chief", "instructor", "student"],
    waitFor: "[data-testid=curve-chart]",
  },
  {
    name: "curve-lab-projector",
    path: (fx) => `/curve-lab/demos/${fx.curveLabBucketDemo}/projector`,
    roles: ["chief", "instructor", "student"],
    waitFor: "[data-testid=key-legend]",
  },
  { name: "curve-lab-demo-new", path: "/curve-lab/demos/new", roles: ["chief", "instructor"], waitFor: "[data-testid=curve-chart]" },
  {
    name: "curve-lab-airframes",
    path: "/curve-lab/airframes",
    roles: ["chief", "instructor"],
    waitFor: "[data-testid=airframe-list] tbody tr",
  },
  { name: "curve-lab-airframes-forbidden", path: "/curve-lab/airframes", roles: ["student"], waitFor: "h1", status: 403 },
  {
    name: "curve-lab-airframe",
    path: (fx) => `/curve-lab/airframes/${fx.curveLabWrenAirframe}`,
    roles: ["chief", "instructor"],
    waitFor: "[data-testid=derived-figures]",
  },
  {
    name: "curve-lab-airframe-new",
    path: "/curve-lab/airframes/new",
    roles: ["chief", "instructor"],
    waitFor: "[data-testid=airframe-form]",
  },
  {
    name: "curve-lab-airframe-edit",
    path: (fx) => `/curve-lab/airframes/${fx.curveLabWrenAirframe}/edit`,
    roles: ["chief", "instructor"],
    waitFor: "[data-testid=airframe-form]",
  },
  // ---- timetable, rosters, Ground log ----
  { name: "timetable-week", path: "/timetable", roles: ["chief", "instructor", "student"], waitFor: "main h1" },
  {
    name: "timetable-list",
    path: "/timetable/list",
    roles: ["chief", "instructor", "student"],
    waitFor: "[data-testid=sessions-table] tbody tr",
  },
  { name: "timetable-new", path: "/timetable/new", roles: ["chief", "instructor"], waitFor: "form" },
  {
    name: "timetable-session",
    path: (fx) => `/timetable/${fx.kestrelSessionSoon}`,
    roles: ["chief", "instructor", "student"],
    waitFor: "main h1",
  },
  {
    name: "timetable-attendance",
    path: (fx) => `/timetable/${fx.kestrelSessionRecorded}`,
    roles: ["chief", "instructor"],
    waitFor: "[data-testid=attendance-recorded]",
  },
  { name: "timetable-forbidden", path: "/timetable", roles: ["sponsor"], waitFor: "h1", status: 403 },
  { name: "roster", path: "/roster", roles: ["chief", "instructor"], waitFor: "main h1" },
  // the Roster paged and filtered (part of the name), as a school too large for one list uses it
  { name: "roster-find", path: "/roster?name=a", roles: ["chief", "instructor"], waitFor: "[aria-label='Find a student']" },
  { name: "ground-log", path: "/ground-log", roles: ["chief", "instructor", "student", "sponsor"], waitFor: "main h1" },
  // the student picker filtered (part of the name), as a school too large for one list uses it
  { name: "ground-log-find", path: "/ground-log?name=a", roles: ["chief", "instructor"], waitFor: "[aria-label='Find a student']" },
  // ---- briefings, assignments, syllabus revisions ----
  { name: "briefings", path: "/briefings", roles: ["chief", "instructor", "student"], waitFor: "[data-testid=briefings-table] tbody tr" },
  { name: "briefing", path: (fx) => `/briefings/${fx.briefingVmd}`, roles: ["chief", "instructor", "student"], waitFor: "#briefing-title" },
  { name: "briefing-new", path: "/briefings/new", roles: ["chief", "instructor"], waitFor: "form" },
  { name: "briefing-edit", path: (fx) => `/briefings/${fx.briefingVmd}/edit`, roles: ["chief", "instructor"], waitFor: "form" },
  { name: "briefings-forbidden", path: "/briefings", roles: ["sponsor"], waitFor: "h1", status: 403 },
  { name: "assignments", path: "/assignments", roles: ["chief", "instructor", "student"], waitFor: "main h1" },
  { name: "assignments-bad-page", path: "/assignments?page=0", roles: ["chief"], waitFor: "#h-set ~ [role=alert]" },
  {
    name: "assignment",
    path: (fx) => `/assignments/${fx.assignmentVmdKestrel}`,
    roles: ["chief", "instructor"],
    waitFor: "[data-testid=completion-table]",
  },
  { name: "assignments-forbidden", path: "/assignments", roles: ["sponsor"], waitFor: "h1", status: 403 },
  { name: "syllabus-revisions", path: "/syllabus/revisions", roles: ["chief"], waitFor: "[data-testid=syllabus-revisions]" },
  {
    name: "syllabus-revisions-find",
    path: "/syllabus/revisions?name=a&revision=not-an-id",
    roles: ["chief"],
    waitFor: "[aria-label='Find enrolments'] ~ [role=alert]",
  },
  { name: "syllabus-revision-new", path: "/syllabus/revisions/new", roles: ["chief"], waitFor: "form" },
  // ---- records: oral checks, sign-offs, Progress map, Sign-off register ----
  { name: "records", path: "/records", roles: ["chief", "instructor"], waitFor: "[data-testid=record-student]" },
  { name: "records-forbidden", path: "/records", roles: ["student", "sponsor"], waitFor: "h1", status: 403 },
  {
    name: "records-student",
    path: (fx) => `/records/${fx.student}`,
    roles: ["chief", "instructor"],
    waitFor: "[data-testid=outcome-preview]",
  },
  { name: "records-student-not-theirs", path: (fx) => `/records/${fx.otherStudent}`, roles: ["instructor"], waitFor: "h1", status: 404 },
  { name: "progress", path: "/progress", roles: ["chief", "instructor"], waitFor: "main h1" },
  // the Progress map list filtered and on a later page (the page links keep the filter)
  {
    name: "progress-find-page-2",
    path: "/progress?name=a&page=2",
    roles: ["chief", "instructor"],
    waitFor: "[data-testid=progress-pages]",
  },
  {
    name: "progress-student",
    path: (fx) => `/progress/${fx.student}`,
    roles: ["chief", "instructor", "student", "sponsor"],
    waitFor: "[data-testid=progress-grid]",
  },
  { name: "progress-not-theirs", path: (fx) => `/progress/${fx.cohortmate}`, roles: ["student", "sponsor"], waitFor: "h1", status: 404 },
  { name: "register", path: "/register", roles: ["chief"], waitFor: "[data-testid=register-table]" },
  { name: "register-chain", path: "/register/chain", roles: ["chief"], waitFor: "[data-testid=chain-result]" },
  { name: "register-forbidden", path: "/register", roles: ["instructor"], waitFor: "h1", status: 403 },
  // ---- mail ----
  { name: "mail-tray", path: "/mail", roles: ["chief"], waitFor: "main h1" },
  { name: "mail-outbox", path: "/mail/outbox", roles: ["chief"], waitFor: "main h1" },
  { name: "mail-notes", path: "/mail/notes", roles: ["chief", "instructor"], waitFor: "main h1" },
  { name: "mail-tray-forbidden", path: "/mail", roles: ["instructor"], waitFor: "h1", status: 403 },
  { name: "mail-letters", path: "/mail/letters", roles: ["chief"], waitFor: "main h1" },
  // the sponsor links narrowed by a part of a name, on a later page (the page links keep it)
  { name: "mail-letters-find-page-2", path: "/mail/letters?name=a&page=2", roles: ["chief"], waitFor: "[data-testid=letter-links-pages]" },
  {
    name: "mail-letters-preview",
    path: (fx) => `/mail/letters?sponsor=${fx.sponsor}&student=${fx.student}`,
    roles: ["chief"],
    waitFor: "[data-testid=letter-preview]",
  },
  { name: "mail-letters-forbidden", path: "/mail/letters", roles: ["instructor", "sponsor"], waitFor: "h1", status: 403 },
  // ---- consent and sponsors ----
  { name: "sharing", path: "/sharing", roles: ["student"], waitFor: "[data-testid=sponsor-consent]" },
  { name: "sharing-forbidden", path: "/sharing", roles: ["sponsor", "chief"], waitFor: "h1", status: 403 },
  {
    name: "sharing-student",
    path: (fx) => `/sharing/${fx.student}`,
    roles: ["chief", "instructor"],
    waitFor: "[data-testid=sponsor-consent]",
  },
  { name: "sharing-student-not-theirs", path: (fx) => `/sharing/${fx.otherStudent}`, roles: ["instructor"], waitFor: "h1", status: 404 },
  { name: "letters", path: "/letters", roles: ["sponsor"], waitFor: "[data-testid=letter-history]" },
  { name: "letters-forbidden", path: "/letters", roles: ["student"], waitFor: "h1", status: 403 },
  { name: "settings", path: "/settings", roles: ["chief"], waitFor: "main h1" },
  // ---- rooms ----
  { name: "rooms", path: "/rooms", roles: ["chief"], waitFor: "[data-testid=rooms-table] tbody tr" },
  { name: "rooms-forbidden", path: "/rooms", roles: ["instructor"], waitFor: "h1", status: 403 },
  // ---- cohorts ----
  { name: "cohorts", path: "/cohorts", roles: ["chief"], waitFor: "[data-testid=cohorts-table] tbody tr" },
  { name: "cohorts-find", path: "/cohorts?name=a", roles: ["chief"], waitFor: "[aria-label='Find a cohort']" },
  { name: "cohorts-forbidden", path: "/cohorts", roles: ["instructor"], waitFor: "h1", status: 403 },
  // ---- knowledge-test endorsements ----
  { name: "endorsements", path: "/endorsements", roles: ["chief", "instructor"], waitFor: "main h1" },
  {
    name: "endorsements-find",
    path: "/endorsements?name=a",
    roles: ["chief", "instructor"],
    waitFor: '[aria-label="Find a student\'s endorsements"]',
  },
  { name: "endorsements-bad-page", path: "/endorsements?page=zero", roles: ["chief"], waitFor: "[role=alert]" },
  { name: "endorsements-forbidden", path: "/endorsements", roles: ["student"], waitFor: "h1", status: 403 },
  { name: "endorsements-pass-rate", path: "/endorsements/pass-rate", roles: ["chief"], waitFor: "[data-testid=pass-rate-table] tbody tr" },
  { name: "endorsements-pass-rate-forbidden", path: "/endorsements/pass-rate", roles: ["instructor"], waitFor: "h1", status: 403 },
  { name: "endorsements-settings", path: "/endorsements/settings", roles: ["chief"], waitFor: "main h1" },
  { name: "endorsements-settings-forbidden", path: "/endorsements/settings", roles: ["instructor"], waitFor: "h1", status: 403 },
  // ---- end of training ----
  { name: "completion", path: "/completion", roles: ["chief"], waitFor: "[data-testid=in-training] tbody tr" },
  { name: "completion-find", path: "/completion?name=a", roles: ["chief"], waitFor: "[aria-label='Find a student']" },
  { name: "completion-forbidden", path: "/completion", roles: ["instructor", "student"], waitFor: "h1", status: 403 },
  {
    name: "completion-student",
    path: (fx) => `/completion/${fx.student}`,
    roles: ["chief"],
    waitFor: "form[aria-label^='End the training']",
  },
  { name: "completion-graduate", path: (fx) => `/completion/${fx.graduate}`, roles: ["chief"], waitFor: "[data-testid=certificate-link]" },
  // ---- transfers in and retention ----
  { name: "transfers", path: "/transfers", roles: ["chief"], waitFor: "[data-testid=transfer-credit]" },
  { name: "transfers-find", path: "/transfers?name=a", roles: ["chief"], waitFor: '[aria-label="Find a student\'s credits"]' },
  { name: "transfers-forbidden", path: "/transfers", roles: ["instructor", "student", "sponsor"], waitFor: "h1", status: 403 },
  { name: "retention", path: "/retention", roles: ["chief"], waitFor: "li[data-state=due]" },
  { name: "retention-one-state", path: "/retention?state=due", roles: ["chief"], waitFor: "li[data-state=due]" },
  { name: "retention-bad-state", path: "/retention?state=gone", roles: ["chief"], waitFor: "[role=alert]" },
  { name: "retention-forbidden", path: "/retention", roles: ["instructor", "student", "sponsor"], waitFor: "h1", status: 403 },
  // ---- people: invitations and roles ----
  { name: "people-accounts", path: "/people/accounts", roles: ["chief"], waitFor: "[data-testid=accounts-table] tbody tr" },
  { name: "people-accounts-find", path: "/people/accounts?name=a", roles: ["chief"], waitFor: "[aria-label='Find an account']" },
  { name: "people-accounts-forbidden", path: "/people/accounts", roles: ["instructor", "sponsor"], waitFor: "h1", status: 403 },
  { name: "set-password-invalid", path: "/set-password/not-a-valid-link", roles: ["signedOut"], waitFor: "h1" },
  { name: "unsubscribe-invalid", path: "/unsubscribe/not-a-valid-link", roles: ["signedOut"], waitFor: "h1" },
];
