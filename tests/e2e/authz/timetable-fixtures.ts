// The Timetable's fixtures for the authorisation harness and the crawler (seed: db/seed/timetable.ts).
// Sessions are found by cohort, room and their offset from today; each mutating harness cell gets
// its own target so the callers' calls do not depend on each other's order.

/** A fixed feed token for the seeded end-to-end database only (the feed route stores its sha256). */
export const HARNESS_CALENDAR_TOKEN = "harnessCalendarFeedTokenForAdaQuill01234567";

const session = (cohort: string, dayOffset: number, room: string) => ({
  sql: `SELECT s.id FROM training_sessions s JOIN cohorts c ON c.id = s.cohort_id
         WHERE c.name = $1 AND s.room = $3 AND (s.starts_at AT TIME ZONE 'Europe/London')::date = current_date + $2::int
         ORDER BY s.starts_at LIMIT 1`,
  params: [cohort, dayOffset, room],
});
const openMakeup = (offset: number) => ({
  sql: `SELECT m.id FROM makeup_items m JOIN cohort_memberships cm ON cm.student_id = m.student_id AND cm.to_date IS NULL
          JOIN cohorts c ON c.id = cm.cohort_id WHERE c.name = 'Kestrel cohort' AND m.state = 'open' ORDER BY m.id LIMIT 1 OFFSET ${offset}`,
});
const pastEntry = (email: string) => ({
  sql: `SELECT g.entry_id AS id FROM ground_log_current g JOIN people p ON p.id = g.student_id
         WHERE lower(p.email) = $1 AND g.occurred_at < now() - interval '5 days' ORDER BY g.occurred_at DESC LIMIT 1`,
  params: [email],
});

export const TIMETABLE_LOOKUPS: Record<string, { sql: string; params?: unknown[] }> = {
  briefing: {
    sql: `SELECT b.id FROM briefings b JOIN briefing_revisions r ON r.id = b.current_revision_id ORDER BY b.created_at, r.title LIMIT 1`,
  },
  /** tomorrow's Kestrel session (Ada attends): read-only targets */
  kestrelSessionSoon: session("Kestrel cohort", 1, "Hangar classroom"),
  /** reschedule targets: chief moves a Merlin session, the Kestrel lead his own */
  merlinSessionToMove: session("Merlin cohort", 9, "Briefing room 2"),
  kestrelSessionToMove: session("Kestrel cohort", 8, "Hangar classroom"),
  /** cancel targets */
  merlinSessionToCancel: session("Merlin cohort", 5, "Briefing room 2"),
  kestrelSessionToCancel: session("Kestrel cohort", 10, "Briefing room 2"),
  /** ended sessions without attendance */
  kestrelSessionAwaiting: session("Kestrel cohort", -3, "Hangar classroom"),
  merlinSessionAwaiting: session("Merlin cohort", -2, "Briefing room 2"),
  /** a past Kestrel session with attendance recorded */
  kestrelSessionRecorded: session("Kestrel cohort", -6, "Hangar classroom"),
  studentEntry: pastEntry("student@chalkwing.test"),
  otherStudentEntry: pastEntry("lotte.lindqvist@chalkwing.test"),
  makeupA: openMakeup(0),
  makeupB: openMakeup(1),
  makeupC: openMakeup(2),
  makeupD: openMakeup(3),
  makeupE: openMakeup(4),
  merlinMover: { sql: `SELECT id FROM people WHERE lower(email) = $1`, params: ["esme.oduya@chalkwing.test"] },
  kestrelMover: { sql: `SELECT id FROM people WHERE lower(email) = $1`, params: ["maren.tofte@chalkwing.test"] },
  /** sets a known feed token for student@ (only its hash is stored) and returns the token */
  calendarToken: {
    sql: `WITH p AS (SELECT id FROM people WHERE lower(email) = 'student@chalkwing.test'),
               w AS (INSERT INTO calendar_feeds (person_id, token_hash) SELECT id, encode(sha256(convert_to($1::text, 'UTF8')), 'hex') FROM p
                     ON CONFLICT (person_id) DO UPDATE SET token_hash = EXCLUDED.token_hash RETURNING person_id)
          SELECT $1::text AS id FROM w`,
    params: [HARNESS_CALENDAR_TOKEN],
  },
};
