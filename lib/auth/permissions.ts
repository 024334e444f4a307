import type { Role } from "./roles";

/**
 * Permissions as data: the one place that says which roles may do what.
 * Code asks for a permission (`requirePermission("records.sign")`), never for a role name.
 */
export const PERMISSIONS = {
  "today.view": { roles: ["chief", "instructor", "student", "sponsor"], description: "See one's own Today page" },
  "today.school": { roles: ["chief"], description: "Today: the school's overview (head counts, currency, locked sign-ins, records)" },
  "today.teaching": { roles: ["instructor"], description: "Today: one's cohorts and the attendance still to record" },
  "today.learning": { roles: ["student"], description: "Today: one's week, ground hours, assignments and next sessions" },
  "today.sponsoring": { roles: ["sponsor"], description: "Today: the progress the students one sponsors share" },
  "people.view": { roles: ["chief", "instructor"], description: "See the school's people and rosters" },
  "people.all": { roles: ["chief"], description: "See everyone at the school and every cohort's roster (others: the cohorts they lead)" },
  "students.all": { roles: ["chief"], description: "See every student of the school (records, progress, Ground log, timetable)" },
  "students.taught": { roles: ["instructor"], description: "See the students one teaches: cohorts one leads, sessions one teaches" },
  "students.examine": {
    roles: ["instructor"],
    description: "See any student of the school as a designated check instructor (stage checks)",
  },
  "students.own": { roles: ["student"], description: "See one's own progress, Ground log and timetable" },
  "students.sponsored": { roles: ["sponsor"], description: "See what a linked student shares with their sponsors" },
  "people.unlock": { roles: ["chief"], description: "Lift a sign-in lock on an account" },
  "qualifications.manage": {
    roles: ["chief"],
    description: "Add and change instructors' qualifications, recency dates and courses (each change kept in the instructor's file)",
  },
  "syllabus.view": { roles: ["chief", "instructor", "student"], description: "Read the syllabus" },
  "syllabus.all": { roles: ["chief", "instructor"], description: "Read every course's syllabus (students: the course they are on)" },
  "syllabus.edit": { roles: ["chief"], description: "Make syllabus revisions and move enrolments between them" },
  "roster.manage": { roles: ["chief", "instructor"], description: "Add students, import rosters, move students between cohorts" },
  "roster.all": { roles: ["chief"], description: "Manage every cohort's roster, not only the cohorts one leads" },
  "airframes.view": { roles: ["chief", "instructor"], description: "See aircraft profiles" },
  "airframes.edit": { roles: ["chief", "instructor"], description: "Create, edit, duplicate and retire aircraft profiles" },
  "demos.edit": { roles: ["chief", "instructor"], description: "Build, save and delete demos in Curve Lab" },
  "demos.view": { roles: ["chief", "instructor", "student"], description: "Open demos (students: only those assigned)" },
  "demos.call": { roles: ["student"], description: "Make a Call it first prediction on an assigned demo" },
  "practice.take": {
    roles: ["student"],
    description: "Answer practice questions on one's own demos and syllabus items (never an oral check)",
  },
  "practice.view": { roles: ["chief", "instructor"], description: "See a student's practice readiness per item (scoped as Records)" },
  "demos.manage": { roles: ["chief"], description: "Change, rename and delete any demo of the school, not only one's own" },
  "briefings.edit": { roles: ["chief", "instructor"], description: "Write briefings and upload handouts" },
  "briefings.all": {
    roles: ["chief", "instructor"],
    description: "Read every briefing of the school (others only those scheduled or assigned to them)",
  },
  "briefings.view": {
    roles: ["chief", "instructor", "student"],
    description: "Read briefings (students: only those scheduled or assigned)",
  },
  "timetable.view": { roles: ["chief", "instructor", "student"], description: "See the Timetable (each sees what concerns them)" },
  "timetable.schedule": { roles: ["chief", "instructor"], description: "Schedule, reschedule and cancel sessions" },
  "timetable.manage": {
    roles: ["chief"],
    description: "Change any session and record its attendance, not only those one teaches or whose cohort one leads",
  },
  "attendance.record": { roles: ["chief", "instructor"], description: "Record attendance and credited minutes" },
  "makeup.waive": { roles: ["chief"], description: "Waive a student's make-up item, with a reason" },
  "groundlog.view": { roles: ["chief", "instructor", "student", "sponsor"], description: "See a Ground log (scoped to the caller)" },
  "assignments.manage": { roles: ["chief", "instructor"], description: "Assign briefings and demos" },
  "assignments.complete": { roles: ["student"], description: "Mark one's own assignments done" },
  "checks.record": { roles: ["chief", "instructor"], description: "Record oral checks" },
  "checks.acknowledge": { roles: ["student"], description: "Acknowledge the debrief of one's own oral check" },
  "records.sign": { roles: ["chief", "instructor"], description: "Sign off syllabus items" },
  "records.amend": { roles: ["chief", "instructor"], description: "Amend or withdraw one's signed records" },
  "records.manage": { roles: ["chief"], description: "Amend or withdraw any instructor's oral checks and sign-offs, not only one's own" },
  "stagechecks.conduct": {
    roles: ["chief", "instructor"],
    description: "Conduct stage checks (designated check instructors and the chief)",
  },
  "stagechecks.designate": { roles: ["chief"], description: "Designate check instructors and override examiner rules" },
  "register.view": { roles: ["chief"], description: "See the Sign-off register and watch notes" },
  "records.certify": { roles: ["chief"], description: "Certify printed training records as the chief instructor" },
  "records.inspect": {
    roles: ["chief"],
    description: "Produce a student's inspection pack (record, instructor files, audit chain check, pass rate) as one PDF",
  },
  "register.review": { roles: ["chief"], description: "Mark watch notes of the Sign-off register reviewed, with a remark" },
  "audit.verify": { roles: ["chief"], description: "Verify the audit trail's hash chain" },
  "progress.view": { roles: ["chief", "instructor", "student", "sponsor"], description: "See a Progress map (scoped to the caller)" },
  "mail.tray": { roles: ["chief"], description: "See captured mail (Mail tray) and outbox states" },
  "sponsornotes.write": {
    roles: ["chief", "instructor"],
    description: "Write a note for a student's sponsors, carried by the next Weekly letter",
  },
  "sharing.manage": {
    roles: ["student"],
    description:
      "See one's sponsors and decide what each may see and whether each receives the Weekly letter (adults; a minor's are the school's)",
  },
  "sharing.students": {
    roles: ["chief", "instructor"],
    description: "See the sponsors of the students whose records one keeps, and manage those of a student under 18",
  },
  "sharing.birthdate": {
    roles: ["chief"],
    description: "Record a student's date of birth (under 18, the school manages the student's sponsor links)",
  },
  "letters.received": {
    roles: ["sponsor"],
    description: "Read the Weekly letters one was sent, and turn the letter back on after stopping it",
  },
  "mail.letters": { roles: ["chief"], description: "Preview any sponsor's next Weekly letter and send it now" },
  "settings.edit": { roles: ["chief"], description: "Change school settings: mail sender, reminder lead time, letter day, limits" },
  "people.manage": {
    roles: ["chief"],
    description:
      "Invite staff and sponsors by e-mail, change a person's roles and deactivate or reactivate accounts (their sessions end at once), link sponsors to students",
  },
  "cohorts.manage": {
    roles: ["chief"],
    description: "Create, rename and close cohorts; add students to a cohort and move them between cohorts from a date",
  },
  "rooms.manage": {
    roles: ["chief"],
    description: "Add, rename and take out of use the school's rooms (the Timetable books from this list)",
  },
  "endorsements.view": { roles: ["chief", "instructor"], description: "See the knowledge-test endorsement log (instructors: their own)" },
  "endorsements.all": { roles: ["chief"], description: "See every instructor's knowledge-test endorsements, not only one's own" },
  "endorsements.sign": {
    roles: ["chief", "instructor"],
    description: "Endorse a student for a knowledge test (password re-entry; refused while a precondition is unmet)",
  },
  "endorsements.results": {
    roles: ["chief", "instructor"],
    description: "Record knowledge-test results and the remedial training of missed areas",
  },
  "endorsements.settings": {
    roles: ["chief"],
    description: "Set the authority settings: endorsement wording, pass mark, validity of a result, attempt limit",
  },
  "reports.view": { roles: ["chief"], description: "See the school's reports (first-attempt pass rate per course)" },
  "transfers.manage": {
    roles: ["chief"],
    description: "Record credit from a student's earlier school (ground time, items, evidence, this school's test) and read it",
  },
  "retention.manage": {
    roles: ["chief"],
    description: "Choose the retention rules, set and lift legal holds, and mark records past their retention date archived",
  },
} as const satisfies Record<string, { roles: readonly Role[]; description: string }>;

export type Permission = keyof typeof PERMISSIONS;

export function rolesAllow(roles: readonly Role[], permission: Permission): boolean {
  const allowed: readonly Role[] = PERMISSIONS[permission].roles;
  return roles.some((r) => allowed.includes(r));
}

/** The roles that hold a permission (for data queries that pick people by what they may do, e.g. who may teach a session). */
export function rolesWith(permission: Permission): Role[] {
  return [...PERMISSIONS[permission].roles];
}
