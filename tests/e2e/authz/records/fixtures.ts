// The Records area's fixtures for the authorisation harness and the crawler (seed: db/seed/records.ts).
// Each mutating harness cell has its own target so the callers' calls do not depend on each other.
const person = (email: string) => ({ sql: `SELECT id FROM people WHERE lower(email) = lower($1)`, params: [email] });
const item = (code: string) => ({
  sql: `SELECT i.id FROM syllabus_items i JOIN syllabus_revisions r ON r.id = i.revision_id JOIN courses c ON c.id = r.course_id
         WHERE c.code = 'PPL-GS' AND i.code = $1 ORDER BY r.number DESC LIMIT 1`,
  params: [code],
});
const signOff = (email: string, code: string) => ({
  sql: `SELECT s.id FROM sign_offs s JOIN people p ON p.id = s.student_id JOIN syllabus_items i ON i.id = s.syllabus_item_id
         WHERE lower(p.email) = $1 AND i.code = $2 ORDER BY s.generation DESC LIMIT 1`,
  params: [email, code],
});
const firstCheck = (email: string) => ({
  sql: `SELECT c.id FROM oral_checks c JOIN people p ON p.id = c.student_id WHERE lower(p.email) = $1 ORDER BY c.occurred_at, c.recorded_at LIMIT 1`,
  params: [email],
});

export const RECORDS_LOOKUPS: Record<string, { sql: string; params?: unknown[] }> = {
  recordsItemAer01: item("AER-01"),
  recordsItemAer03: item("AER-03"),
  recordsStageAer: {
    sql: `SELECT g.id FROM syllabus_stages g JOIN syllabus_revisions r ON r.id = g.revision_id JOIN courses c ON c.id = r.course_id
           WHERE c.code = 'PPL-GS' AND g.code = 'AER' ORDER BY r.number DESC LIMIT 1`,
  },
  /** Kestrel: ready for the AER stage check (the chief examines) */
  recordsReadyStudent: person("mateo.ferreira@chalkwing.test"),
  /** Kestrel: meeting check on every AER item, AER-01 unsigned (the lead signs it), four signed */
  recordsSaoirse: person("saoirse.dunleavy@chalkwing.test"),
  /** Kestrel: meeting check on AER-01, unsigned (the chief signs it) */
  recordsBeatriz: person("beatriz.solano@chalkwing.test"),
  /** Kestrel: a new check is recorded on them by the chief and by the lead */
  recordsCallum: person("callum.reay@chalkwing.test"),
  recordsSignOffToWithdrawByLead: signOff("saoirse.dunleavy@chalkwing.test", "AER-02"),
  recordsSignOffToWithdrawByChief: signOff("saoirse.dunleavy@chalkwing.test", "AER-03"),
  recordsSignOffToAmendByLead: signOff("saoirse.dunleavy@chalkwing.test", "AER-04"),
  recordsSignOffToAmendByChief: signOff("saoirse.dunleavy@chalkwing.test", "AER-05"),
  recordsCheckToWithdrawByLead: firstCheck("elin.haugen@chalkwing.test"),
  recordsCheckToWithdrawByChief: firstCheck("ivo.petrak@chalkwing.test"),
  /** Noor's checks on AER-02: the chief amends the first, her lead the latest */
  recordsCheckToAmendByChief: firstCheck("noor.brandt@chalkwing.test"),
  recordsCheckToAmendByLead: {
    sql: `SELECT c.id FROM oral_checks c JOIN people p ON p.id = c.student_id WHERE lower(p.email) = $1 ORDER BY c.occurred_at DESC, c.recorded_at DESC LIMIT 1`,
    params: ["noor.brandt@chalkwing.test"],
  },
  recordsNoor: person("noor.brandt@chalkwing.test"),
  recordsItemAer02: item("AER-02"),
  recordsItemAer04: item("AER-04"),
  recordsItemAer05: item("AER-05"),
  /** Ada's first check: she acknowledges its debrief */
  recordsAdaCheck: firstCheck("student@chalkwing.test"),
};
