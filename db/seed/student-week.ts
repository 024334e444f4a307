import { QueryTypes } from "sequelize";
import { sequelize } from "../index";
import type { SeedContext } from "./extensions";
import { snapshotOfDemo, type DemoAirframe } from "../access/practice/topics";
import { makePracticeQuestion, practiceKinds, scorePractice } from "@/lib/practice/generate";
import { now } from "@/lib/clock";

/**
 * The student's week: a planned end for every demo enrolment (six months from enrolment; the demo
 * student's is two months ahead, so "am I on track?" has a pace to compare with), the date of the
 * knowledge test for the practice test, and a practice history for the demo student (questions on
 * the aircraft of their assigned demos, some right and some not) for the instructor's readiness view.
 */
export async function seedStudentWeek(ctx: SeedContext): Promise<void> {
  const { t, schoolId } = ctx;
  await sequelize.query(
    `UPDATE enrolments e SET planned_end_on = e.enrolled_on + 182 FROM people p
      WHERE p.id = e.student_id AND p.school_id = :schoolId AND e.planned_end_on IS NULL`,
    { replacements: { schoolId }, transaction: t },
  );
  await sequelize.query(
    `UPDATE schools SET settings = settings || jsonb_build_object('knowledgeTestOn', CAST(:on AS text)) WHERE id = :schoolId`,
    {
      replacements: { schoolId, on: ctx.day(45) },
      transaction: t,
    },
  );
  const student = ctx.students["student@chalkwing.test"];
  if (!student) return;
  await sequelize.query(`UPDATE enrolments SET planned_end_on = :end WHERE student_id = :student AND status = 'active'`, {
    replacements: { student, end: ctx.day(60) },
    transaction: t,
  });
  // the demo student's demos (directly or through a briefing) with the items their briefings teach
  const demos = await sequelize.query<{ revisionId: string; name: string; airframe: DemoAirframe | null; itemId: string | null }>(
    `SELECT DISTINCT ON (dr.id) dr.id AS "revisionId", d.name, dr.spec->'airframe' AS airframe,
            (SELECT bi.syllabus_item_id FROM briefing_revision_demos bd2 JOIN briefing_revision_items bi ON bi.briefing_revision_id = bd2.briefing_revision_id
              WHERE bd2.demo_revision_id = dr.id ORDER BY bi.syllabus_item_id LIMIT 1) AS "itemId"
       FROM assignment_students s
       LEFT JOIN briefings b ON b.id = s.briefing_id
       LEFT JOIN briefing_revision_demos bd ON bd.briefing_revision_id = b.current_revision_id
       JOIN demo_revisions dr ON dr.id = COALESCE(bd.demo_revision_id, (SELECT current_revision_id FROM demos WHERE id = s.demo_id))
       JOIN demos d ON d.id = dr.demo_id
      WHERE s.student_id = :student AND s.school_id = :schoolId AND d.deleted_at IS NULL
      ORDER BY dr.id`,
    { replacements: { student, schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  // a fixed sequence instead of Math.random, so the demo is the same every time
  let seed = 7;
  const rand = () => (seed = (seed * 9301 + 49297) % 233280) / 233280;
  let n = 0;
  for (const d of demos) {
    const snap = snapshotOfDemo(d.revisionId, d.name, d.airframe);
    if (!snap) continue;
    for (const kind of practiceKinds(snap)) {
      const q = makePracticeQuestion(kind, snap, rand);
      if (!q) continue;
      n += 1;
      // every third answer is off: the readiness view shows a share below 100 %
      const right = n % 3 !== 0;
      const given =
        q.answer.type === "choice"
          ? { choice: (right ? q.answer.value : q.answer.value === "stable" ? "unstable" : "stable") as "stable" | "unstable" }
          : { figure: Math.round(q.answer.value * (right ? 1 : 1.25) * 10) / 10 };
      await sequelize.query(
        `INSERT INTO practice_attempts (school_id, student_id, syllabus_item_id, demo_revision_id, kind, question, given, correct, answered_at)
         VALUES (:schoolId, :student, :itemId, :revisionId, :kind, CAST(:question AS jsonb), CAST(:given AS jsonb), :correct, :at)`,
        {
          replacements: {
            schoolId,
            student,
            itemId: d.itemId,
            revisionId: d.revisionId,
            kind,
            question: JSON.stringify(q),
            given: JSON.stringify(given),
            correct: scorePractice(q, given),
            at: new Date(now().getTime() - n * 26 * 3600_000),
          },
          transaction: t,
        },
      );
    }
  }
}
