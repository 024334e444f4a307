import type { MigrationContext } from "../migrate";

// Who each assignment is for, one row per student: the named student, or the current members of
// the cohort. With the completion (if any). Overdue is derived by the reader from due_on and the
// school's calendar date; it is never stored.
export async function up({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`
    CREATE VIEW assignment_students AS
      SELECT a.id AS assignment_id, a.school_id, a.kind, a.briefing_id, a.demo_id, a.cohort_id,
             s.student_id, a.due_on, c.completed_at
        FROM assignments a
        CROSS JOIN LATERAL (
          SELECT a.student_id WHERE a.student_id IS NOT NULL
          UNION
          SELECT m.student_id FROM cohort_memberships m WHERE m.cohort_id = a.cohort_id AND m.to_date IS NULL
        ) s(student_id)
        LEFT JOIN assignment_completions c ON c.assignment_id = a.id AND c.student_id = s.student_id;
  `);
}

export async function down({ context }: { context: MigrationContext }) {
  await context.sequelize.query(`DROP VIEW IF EXISTS assignment_students;`);
}
