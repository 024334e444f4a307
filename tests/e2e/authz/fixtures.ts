// Ids looked up in the seeded end-to-end database by stable names and e-mails, for the
// authorisation harness, the crawler and other end-to-end tests. Reading an unknown name throws.
//
// How to add a fixture: one line in LOOKUPS, a name and a query returning one row with a column
// `id` (parameters as $1…). Look things up by what the seed fixes (e-mail, name, code), never by
// position. Add the name to the `Fixtures` interface in types.ts to have it typed as `string`.
import type { Client } from "pg";
import type { Fixtures } from "./types";
import { CURVE_LAB_LOOKUPS } from "./curve-lab-fixtures";
import { TIMETABLE_LOOKUPS } from "./timetable-fixtures";
import { BRIEFINGS_LOOKUPS } from "./briefings/fixtures";
import { RECORDS_LOOKUPS } from "./records/fixtures";
import { ROOMS_LOOKUPS } from "./rooms/fixtures";
import { COMPLETION_LOOKUPS } from "./completion/fixtures";
import { TRANSFERS_LOOKUPS } from "./transfers/fixtures";

const person = (email: string) => ({ sql: `SELECT id FROM people WHERE lower(email) = lower($1)`, params: [email] });

export const LOOKUPS: Record<string, { sql: string; params?: unknown[] }> = {
  // ---- foundation ----
  school: { sql: `SELECT id FROM schools WHERE name = $1`, params: ["Larkhollow Flying School"] },
  chief: person("chief@chalkwing.test"),
  instructor: person("instructor@chalkwing.test"), // leads the Kestrel cohort
  otherInstructor: person("priya.okonjo-hale@chalkwing.test"), // leads the Merlin cohort
  student: person("student@chalkwing.test"), // Kestrel cohort, sponsored by sponsor@
  cohortmate: person("noor.brandt@chalkwing.test"), // Kestrel cohort, another sponsor
  otherStudent: person("lotte.lindqvist@chalkwing.test"), // Merlin cohort
  sponsor: person("sponsor@chalkwing.test"),
  kestrelCohort: { sql: `SELECT id FROM cohorts WHERE name = $1`, params: ["Kestrel cohort"] },
  merlinCohort: { sql: `SELECT id FROM cohorts WHERE name = $1`, params: ["Merlin cohort"] },
  course: { sql: `SELECT id FROM courses WHERE code = $1`, params: ["PPL-GS"] },
  syllabusRevision: {
    sql: `SELECT r.id FROM syllabus_revisions r JOIN courses c ON c.id = r.course_id WHERE c.code = $1 ORDER BY r.number DESC LIMIT 1`,
    params: ["PPL-GS"],
  },
  // made by prepareHarnessTargets (below), locked so the chief's unlock has something to lift
  lockedPerson: person("locked.harness@chalkwing.test"),
  lockedPerson2: person("locked2.harness@chalkwing.test"),

  // ---- other areas: add your lookups below ----
  // ---- Curve Lab ----
  ...CURVE_LAB_LOOKUPS,
  // ---- timetable ----
  ...TIMETABLE_LOOKUPS,
  // ---- briefings, assignments, syllabus revisions ----
  ...BRIEFINGS_LOOKUPS,
  // ---- records ----
  ...RECORDS_LOOKUPS,
  // ---- rooms ----
  ...ROOMS_LOOKUPS,
  // ---- end of training ----
  ...COMPLETION_LOOKUPS,
  // ---- transfers in and retention ----
  ...TRANSFERS_LOOKUPS,
};

export async function loadFixtures(c: Client): Promise<Fixtures> {
  await prepareHarnessTargets(c);
  const out: Record<string, string> = {};
  // A lookup that finds nothing (e.g. a row an earlier test file moved on purpose) fails only
  // the tests that use it, when they use it, instead of every test of the file.
  const missing = new Map<string, string>();
  for (const [name, { sql, params }] of Object.entries(LOOKUPS)) {
    const { rows } = await c.query<{ id: string }>(sql, params ?? []);
    if (rows.length !== 1 || !rows[0]?.id) missing.set(name, `fixture ${name}: expected one row, got ${rows.length}`);
    else out[name] = String(rows[0].id);
  }
  return new Proxy(out, {
    get(target, key) {
      if (typeof key !== "string") return undefined;
      const problem = missing.get(key);
      if (problem) throw new Error(problem);
      if (!(key in target)) {
        // jest's pretty-printer and promise checks probe objects for these names
        if (
          key === "then" ||
          key === "toJSON" ||
          key === "asymmetricMatch" ||
          key === "$$typeof" ||
          key === "nodeType" ||
          key === "constructor"
        )
          return undefined;
        throw new Error(`unknown fixture "${key}": add it to LOOKUPS in tests/e2e/authz/fixtures.ts`);
      }
      return target[key];
    },
  }) as Fixtures;
}

/**
 * Targets the harness needs that the demo seed does not have: two accounts of the demo school,
 * each with a sign-in lock, for the unlock endpoints. Idempotent.
 */
export async function prepareHarnessTargets(c: Client): Promise<void> {
  for (const [name, email] of [
    ["Harness Locked", "locked.harness@chalkwing.test"],
    ["Harness Locked Two", "locked2.harness@chalkwing.test"],
  ] as const) {
    await c.query(
      `INSERT INTO people (school_id, name, email, roles)
       SELECT id, $1, $2, ARRAY['student'] FROM schools WHERE name = 'Larkhollow Flying School'
        AND NOT EXISTS (SELECT 1 FROM people WHERE lower(email) = $2)`,
      [name, email],
    );
    await c.query(
      `INSERT INTO sign_in_throttle (email, address, failures, locked_until, updated_at)
       VALUES ($1, '203.0.113.7', 10, now() + interval '15 minutes', now())
       ON CONFLICT (email, address) DO UPDATE SET failures = 10, locked_until = now() + interval '15 minutes'`,
      [email],
    );
  }
}
