// Fixture lookups for briefings, handouts, assignments and syllabus revisions (see ../fixtures.ts).
// Seeded briefings are found by the title of their first revision, which never changes.
const school = `(SELECT id FROM schools WHERE name = 'Larkhollow Flying School')`;
const briefing = (title: string) => ({
  sql: `SELECT r.briefing_id AS id FROM briefing_revisions r JOIN briefings b ON b.id = r.briefing_id
         WHERE r.number = 1 AND r.title = $1 AND b.school_id = ${school}`,
  params: [title],
});

export const BRIEFINGS_LOOKUPS: Record<string, { sql: string; params?: unknown[] }> = {
  briefingVmd: briefing("The drag curve and Vmd"), // assigned to Kestrel, has the PDF handout and a demo
  briefingSources: briefing("Where drag comes from"), // target of the harness's revise and assign calls
  handoutVmd: { sql: `SELECT h.id FROM handouts h WHERE h.file_name = $1 AND h.school_id = ${school}`, params: ["drag-curve-and-vmd.pdf"] },
  assignmentVmdKestrel: {
    sql: `SELECT a.id FROM assignments a JOIN briefing_revisions r ON r.briefing_id = a.briefing_id AND r.number = 1
           WHERE r.title = $1 AND a.cohort_id = (SELECT id FROM cohorts WHERE name = 'Kestrel cohort') AND a.school_id = ${school}`,
    params: ["The drag curve and Vmd"],
  },
  studentEnrolment: {
    sql: `SELECT e.id FROM enrolments e JOIN people p ON p.id = e.student_id WHERE lower(p.email) = $1 AND e.status = 'active'`,
    params: ["student@chalkwing.test"],
  },
  // A course of the demo school kept for the harness, so the chief's new syllabus revisions never
  // become the latest revision of the real course. Made on first lookup (one statement: the insert
  // or the existing row, never both).
  harnessCourse: {
    sql: `WITH made AS (
            INSERT INTO courses (school_id, code, title, min_ground_minutes)
            SELECT ${school}, 'HARNESS-SYL', 'Harness course (test only)', 60
            ON CONFLICT (school_id, code) DO NOTHING RETURNING id)
          SELECT id FROM made UNION ALL SELECT id FROM courses WHERE code = 'HARNESS-SYL' AND school_id = ${school}`,
  },
};
