import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { formatDay, formatDayTime } from "@/lib/time";
import { QUESTION_OUTCOME_WORDS } from "@/lib/labels";
import { assessOnTrack, type OnTrackAssessment } from "@/lib/progress/on-track";
import { activeEnrolment, type StudentRef } from "../shared/enrolment";
import { getSchool } from "../shared/school";
import { schoolToday } from "../assignments/school-today";
import { listAssignedDemosForStudent } from "../assignments/assigned-to-student";
import { creditedMinutesFor } from "../ground-log/ground-hours";
import { stageReadiness } from "../records/stage-readiness";

// The student's own week on Today: "am I on track?" (lib/progress/on-track.ts) with the facts it
// rests on, the open make-ups, and what to do next, each with a link: the session to prepare for
// (a call to make on its demo before it starts), the make-ups to book, the debriefs to
// acknowledge, and the demo that teaches an item last marked Shaky or Not yet.

export interface NextStep {
  kind: "prepare" | "makeup" | "debrief" | "weak-item";
  text: string;
  href: string;
}

export interface OpenMakeup {
  id: string;
  itemCode: string;
  itemTitle: string;
  state: "open" | "scheduled";
  missed: string | null;
}

export interface StudentWeek {
  student: StudentRef;
  plannedEndOn: string | null;
  creditedMinutes: number;
  assessment: OnTrackAssessment;
  makeups: OpenMakeup[];
  next: NextStep[];
}

type WeakItem = { id: string; code: string; title: string; outcome: "shaky" | "not_yet" };

/** The latest question outcome of each item over the student's standing checks (not withdrawn, not amended); the weak ones. */
async function weakItemsOf(schoolId: string, studentId: string): Promise<WeakItem[]> {
  return sequelize.query<WeakItem>(
    `SELECT * FROM (
       SELECT DISTINCT ON (q.syllabus_item_id) q.syllabus_item_id AS id, i.code, i.title, q.outcome
         FROM oral_check_questions q JOIN oral_checks c ON c.id = q.check_id JOIN syllabus_items i ON i.id = q.syllabus_item_id
        WHERE c.school_id = :schoolId AND c.student_id = :studentId
          AND NOT EXISTS (SELECT 1 FROM oral_check_withdrawals w WHERE w.check_id = c.id)
          AND NOT EXISTS (SELECT 1 FROM oral_checks a WHERE a.amends_id = c.id)
        ORDER BY q.syllabus_item_id, c.occurred_at DESC, q.position DESC) last
      WHERE outcome IN ('shaky', 'not_yet')
      ORDER BY code`,
    { replacements: { schoolId, studentId }, type: QueryTypes.SELECT },
  );
}

export async function studentWeekFor(caller: CurrentUser): Promise<StudentWeek | null> {
  if (!can(caller, "today.learning")) throw new HttpError(403, "today: not a student's Today");
  const student = await activeEnrolment(caller.schoolId, caller.id);
  if (!student) return null;
  const school = await getSchool(caller.schoolId);
  const today = await schoolToday(caller.schoolId);
  const [{ plannedEndOn } = { plannedEndOn: null }] = await sequelize.query<{ plannedEndOn: string | null }>(
    `SELECT planned_end_on AS "plannedEndOn" FROM enrolments WHERE id = :id`,
    { replacements: { id: student.enrolmentId }, type: QueryTypes.SELECT },
  );
  const credited = await creditedMinutesFor(student.id, student.courseId);
  const stages = await stageReadiness(student);
  const nextStage = stages.find((s) => !s.passed) ?? null;
  const makeups = await sequelize.query<OpenMakeup & { missedAt: Date | null; missedTitle: string | null }>(
    `SELECT m.id, i.code AS "itemCode", i.title AS "itemTitle", m.state, s.starts_at AS "missedAt", br.title AS "missedTitle"
       FROM makeup_items m JOIN syllabus_items i ON i.id = m.syllabus_item_id
       LEFT JOIN training_sessions s ON m.source_kind = 'absence' AND s.id = m.source_id
       LEFT JOIN briefing_revisions br ON br.id = s.briefing_revision_id
      WHERE m.student_id = :studentId AND m.state IN ('open', 'scheduled')
      ORDER BY m.state, m.created_at, i.code`,
    { replacements: { studentId: student.id }, type: QueryTypes.SELECT },
  );
  const weak = await weakItemsOf(caller.schoolId, student.id);
  const assessment = assessOnTrack({
    today,
    creditedMinutes: credited,
    minGroundMinutes: student.minGroundMinutes,
    enrolledOn: student.enrolledOn,
    plannedEndOn,
    nextStage: nextStage ? { code: nextStage.code, title: nextStage.title, itemsLeft: nextStage.itemCount - nextStage.signedCount } : null,
    openMakeups: makeups.filter((m) => m.state === "open").length,
    weakItems: weak.map((w) => ({ code: w.code, outcome: w.outcome })),
  });

  const next: NextStep[] = [];
  // the next session the student attends: make the call on each of its demos not yet called
  const [session] = await sequelize.query<{ id: string; startsAt: Date; title: string; revisionId: string }>(
    `SELECT s.id, s.starts_at AS "startsAt", br.title, s.briefing_revision_id AS "revisionId"
       FROM training_sessions s JOIN session_attendees a ON a.session_id = s.id JOIN briefing_revisions br ON br.id = s.briefing_revision_id
      WHERE a.student_id = :studentId AND s.school_id = :schoolId AND s.status = 'scheduled' AND s.starts_at > :now
      ORDER BY s.starts_at LIMIT 1`,
    { replacements: { studentId: student.id, schoolId: caller.schoolId, now: now() }, type: QueryTypes.SELECT },
  );
  if (session) {
    const when = formatDayTime(new Date(session.startsAt), school.timeZone);
    const demos = await sequelize.query<{ demoId: string; name: string; called: boolean; asksCall: boolean }>(
      `SELECT d.id AS "demoId", d.name, (dr.spec->>'callKind') IS NOT NULL AS "asksCall",
              EXISTS (SELECT 1 FROM demo_calls c WHERE c.demo_revision_id = dr.id AND c.student_id = :studentId) AS called
         FROM briefing_revision_demos bd JOIN demo_revisions dr ON dr.id = bd.demo_revision_id JOIN demos d ON d.id = dr.demo_id
        WHERE bd.briefing_revision_id = :revisionId AND d.deleted_at IS NULL ORDER BY d.name`,
      { replacements: { studentId: student.id, revisionId: session.revisionId }, type: QueryTypes.SELECT },
    );
    const toCall = demos.filter((d) => d.asksCall && !d.called);
    for (const d of toCall)
      next.push({
        kind: "prepare",
        text: `Make your call on the demo “${d.name}” before ${session.title}, ${when}`,
        href: `/curve-lab/demos/${d.demoId}`,
      });
    if (toCall.length === 0)
      next.push({ kind: "prepare", text: `Prepare for ${session.title}, ${when}`, href: `/timetable/${session.id}` });
  }
  for (const m of makeups.filter((x) => x.state === "open"))
    next.push({
      kind: "makeup",
      text: `Book a make-up for ${m.itemCode} ${m.itemTitle} with ${student.leadInstructorName ?? "your instructor"}`,
      href: "/ground-log#makeup-title",
    });
  const debriefs = await sequelize.query<{ id: string; occurredAt: Date; instructorName: string }>(
    `SELECT c.id, c.occurred_at AS "occurredAt", p.name AS "instructorName"
       FROM oral_checks c JOIN people p ON p.id = c.instructor_id
      WHERE c.school_id = :schoolId AND c.student_id = :studentId
        AND NOT EXISTS (SELECT 1 FROM oral_check_acknowledgements k WHERE k.check_id = c.id)
        AND NOT EXISTS (SELECT 1 FROM oral_check_withdrawals w WHERE w.check_id = c.id)
        AND NOT EXISTS (SELECT 1 FROM oral_checks a WHERE a.amends_id = c.id)
      ORDER BY c.occurred_at`,
    { replacements: { schoolId: caller.schoolId, studentId: student.id }, type: QueryTypes.SELECT },
  );
  for (const c of debriefs)
    next.push({
      kind: "debrief",
      text: `Read and acknowledge the debrief of your oral check with ${c.instructorName} on ${formatDay(new Date(c.occurredAt), school.timeZone)}`,
      href: `/progress/${student.id}#checks-title`,
    });
  if (weak.length > 0) {
    // a demo the student may open, used by a briefing revision that teaches the weak item
    const mine = await listAssignedDemosForStudent(caller.schoolId, student.id);
    const teaching = await sequelize.query<{ itemId: string; demoRevisionId: string }>(
      `SELECT DISTINCT bi.syllabus_item_id AS "itemId", bd.demo_revision_id AS "demoRevisionId"
         FROM briefing_revision_items bi JOIN briefing_revision_demos bd ON bd.briefing_revision_id = bi.briefing_revision_id
        WHERE bi.syllabus_item_id = ANY(ARRAY[:items]::uuid[])`,
      { replacements: { items: weak.map((w) => w.id) }, type: QueryTypes.SELECT },
    );
    for (const w of weak) {
      const revs = new Set(teaching.filter((x) => x.itemId === w.id).map((x) => x.demoRevisionId));
      const demo = mine.find((d) => revs.has(d.demoRevisionId));
      if (demo)
        next.push({
          kind: "weak-item",
          text: `Work through the demo “${demo.name}”: it teaches ${w.code} ${w.title}, last marked ${QUESTION_OUTCOME_WORDS[w.outcome]}`,
          href: `/curve-lab/demos/${demo.demoId}`,
        });
    }
  }
  return {
    student,
    plannedEndOn,
    creditedMinutes: credited,
    assessment,
    makeups: makeups.map((m) => ({
      id: m.id,
      itemCode: m.itemCode,
      itemTitle: m.itemTitle,
      state: m.state,
      missed: m.missedAt ? `${m.missedTitle ?? "a session"}, ${formatDay(new Date(m.missedAt), school.timeZone)}` : null,
    })),
    next,
  };
}
