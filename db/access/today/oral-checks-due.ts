import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { studentScopeSql, type Caller } from "../shared/student-scope";
import { cachedSummary } from "../shared/summary-cache";

// The instructor's Today, "checks due": the syllabus items ready for an oral check. An item is
// ready for a student when it was taught in a session the student attended (attended, late or left
// early, as the Progress map's "Taught") and the student has no satisfactory oral check on it yet:
// no check in force (not withdrawn, not amended) whose own result for the item meets the standard,
// and no current sign-off. Scoped twice: the students whose records the caller keeps, and among
// them those the caller teaches (they taught the session, or they lead the student's cohort), so a
// designated check instructor is not shown the whole school.

export interface OralCheckDue {
  studentId: string;
  studentName: string;
  items: { id: string; code: string; title: string }[];
  /** the latest session in which one of these items was taught */
  lastTaughtAt: Date;
}

/** The first `limit` students (by name) with items ready for an oral check. */
export async function oralChecksDue(caller: Caller, limit = 40): Promise<OralCheckDue[]> {
  return (await oralChecksDueTop(caller, limit)).students;
}

/**
 * The first `limit` students (by name) with items ready for an oral check, and how many students
 * have such items in all: one query, the students bounded in SQL (a rank over the students), so
 * the rows read stay bounded whatever the number of students taught.
 */
export async function oralChecksDueTop(caller: Caller, limit: number): Promise<{ students: OralCheckDue[]; total: number }> {
  // read over every student taught: kept per caller while the records are unchanged (cachedSummary)
  const key = `oral-checks-due:${limit}:${caller.id}:${[...caller.roles].sort().join(",")}`;
  return cachedSummary(
    caller.schoolId,
    key,
    () => computeOralChecksDue(caller, limit),
    (stored) => {
      const v = stored as { students: (Omit<OralCheckDue, "lastTaughtAt"> & { lastTaughtAt: string })[]; total: number };
      return { total: v.total, students: v.students.map((s) => ({ ...s, lastTaughtAt: new Date(s.lastTaughtAt) })) };
    },
  );
}

async function computeOralChecksDue(caller: Caller, limit: number): Promise<{ students: OralCheckDue[]; total: number }> {
  const scope = studentScopeSql(caller, "records", "g.student_id");
  const rows = await sequelize.query<{
    student_id: string;
    student_name: string;
    item_id: string;
    code: string;
    title: string;
    last_taught: Date;
    total: number;
  }>(
    `WITH taught AS (
       SELECT g.student_id, x.item_id, max(g.occurred_at) AS last_taught
         FROM ground_log_current g CROSS JOIN LATERAL unnest(g.syllabus_item_ids) AS x(item_id)
        WHERE g.school_id = :schoolId AND g.session_id IS NOT NULL AND g.status IN ('attended','late','left_early')
          AND ${scope.sql}
          AND (g.instructor_id = :me OR g.student_id IN (
                SELECT m.student_id FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
                 WHERE c.lead_instructor_id = :me AND c.school_id = :schoolId AND m.to_date IS NULL))
        GROUP BY g.student_id, x.item_id
     )
     , due AS (
     SELECT t.student_id, p.name AS student_name, i.id AS item_id, i.code, i.title, t.last_taught,
            st.position AS stage_position, i.position AS item_position
       FROM taught t
       JOIN people p ON p.id = t.student_id AND p.active
       JOIN active_enrolments e ON e.student_id = t.student_id
       JOIN syllabus_items i ON i.id = t.item_id AND i.revision_id = e.revision_id
       JOIN syllabus_stages st ON st.id = i.stage_id
      WHERE NOT EXISTS (
              SELECT 1 FROM oral_checks oc JOIN oral_check_items oi ON oi.check_id = oc.id AND oi.syllabus_item_id = i.id
               WHERE oc.student_id = t.student_id
                 AND NOT EXISTS (SELECT 1 FROM oral_check_withdrawals w WHERE w.check_id = oc.id)
                 AND NOT EXISTS (SELECT 1 FROM oral_checks a WHERE a.amends_id = oc.id)
                 AND EXISTS (SELECT 1 FROM jsonb_array_elements(oc.item_outcomes) o
                              WHERE o->>'itemId' = i.id::text AND (o->>'meets')::boolean))
        AND NOT EXISTS (
              SELECT 1 FROM sign_offs s
               WHERE s.student_id = t.student_id AND s.syllabus_item_id = i.id
                 AND NOT EXISTS (SELECT 1 FROM sign_off_withdrawals w WHERE w.sign_off_id = s.id)
                 AND NOT EXISTS (SELECT 1 FROM sign_offs a WHERE a.amends_id = s.id))
     ), ranked AS (
       SELECT d.student_id, dense_rank() OVER (ORDER BY d.student_name, d.student_id) AS rk
         FROM (SELECT DISTINCT student_id, student_name FROM due) d
     )
     SELECT d.student_id, d.student_name, d.item_id, d.code, d.title, d.last_taught,
            (SELECT count(*) FROM ranked)::int AS total
       FROM due d JOIN ranked r ON r.student_id = d.student_id
      WHERE r.rk <= :limit
      ORDER BY r.rk, d.stage_position, d.item_position`,
    {
      replacements: { schoolId: caller.schoolId, me: caller.id, limit, ...scope.replacements },
      type: QueryTypes.SELECT,
    },
  );
  const byStudent = new Map<string, OralCheckDue>();
  for (const r of rows) {
    let s = byStudent.get(r.student_id);
    if (!s) {
      s = { studentId: r.student_id, studentName: r.student_name, items: [], lastTaughtAt: r.last_taught };
      byStudent.set(r.student_id, s);
    }
    s.items.push({ id: r.item_id, code: r.code, title: r.title });
    if (r.last_taught > s.lastTaughtAt) s.lastTaughtAt = r.last_taught;
  }
  return { students: [...byStudent.values()], total: rows[0]?.total ?? 0 };
}
