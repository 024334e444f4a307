import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { assessWeek, type WeekAssessment } from "@/lib/mail/week-assessment";
import type { CheckOutcome } from "@/lib/records/outcome";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { activeEnrolment } from "../shared/enrolment";
import { getSchool } from "../shared/school";
import { creditedMinutesFor } from "../ground-log/ground-hours";
import { itemsOfRevision } from "../records/items";
import { currentSignOffs } from "../records/sign-offs";

// What a sponsor's Today says about each student they sponsor, in plain words: one entry per
// student, each part only when the student shares it with this sponsor (read from the link on
// every request, so a change of consent shows at once). Items always carry their title.

export type LetterStatus = "on" | "stopped-by-you" | "stopped-by-student";

export interface SponsoredOverview {
  studentId: string;
  name: string;
  courseTitle: string | null;
  hours: { minutes: number; minimumMinutes: number } | null;
  milestones: { signed: number; total: number; latest: { code: string; title: string; on: string } | null } | null;
  latestCheck: { items: string; outcome: CheckOutcome; on: string } | null;
  /** the week's assessment (shared with milestones: the same one the Weekly letter gives) */
  assessment: WeekAssessment | null;
  shares: { attendance: boolean; hours: boolean; milestones: boolean; outcomes: boolean; schedule: boolean };
  letter: LetterStatus;
  /** whether a Progress map is open to this sponsor (milestones shared) */
  progressLink: boolean;
}

export async function sponsorOverview(caller: Pick<CurrentUser, "id" | "schoolId">, t?: Transaction): Promise<SponsoredOverview[]> {
  const school = await getSchool(caller.schoolId, t);
  const links = await sequelize.query<{
    student_id: string;
    name: string;
    shares_attendance: boolean;
    shares_hours: boolean;
    shares_progress: boolean;
    shares_outcomes: boolean;
    shares_schedule: boolean;
    weekly_letter: boolean;
    stopped: boolean;
  }>(
    `SELECT l.student_id, st.name, l.shares_attendance, l.shares_hours, l.shares_progress, l.shares_outcomes, l.shares_schedule, l.weekly_letter,
            EXISTS (SELECT 1 FROM mail_unsubscribes u WHERE u.sponsor_id = l.sponsor_id AND u.student_id = l.student_id AND u.kind = 'weekly.letter') AS stopped
       FROM sponsor_links l JOIN people st ON st.id = l.student_id
      WHERE l.sponsor_id = :me AND st.school_id = :school AND st.active
      ORDER BY st.name`,
    { replacements: { me: caller.id, school: caller.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  const at = now();
  const weekAgo = new Date(at.getTime() - 7 * 86_400_000);
  const out: SponsoredOverview[] = [];
  for (const l of links) {
    const e = await activeEnrolment(caller.schoolId, l.student_id, t);
    const q = <T extends object>(sql: string, r: Record<string, unknown> = {}) =>
      sequelize.query<T>(sql, { replacements: { sid: l.student_id, from: weekAgo, at, ...r }, type: QueryTypes.SELECT, transaction: t });
    let milestones: SponsoredOverview["milestones"] = null;
    let assessment: WeekAssessment | null = null;
    if (l.shares_progress && e) {
      const items = await itemsOfRevision(e.revisionId, t);
      const byId = new Map(items.map((i) => [i.id, i]));
      const signed = (await currentSignOffs(l.student_id, t)).filter((s) => byId.has(s.itemId));
      const latest = [...signed].sort((a, b) => +new Date(b.signedAt) - +new Date(a.signedAt))[0];
      const latestItem = latest ? byId.get(latest.itemId) : undefined;
      milestones = {
        signed: signed.length,
        total: items.length,
        latest: latest && latestItem ? { code: latestItem.code, title: latestItem.title, on: String(latest.signedOn).slice(0, 10) } : null,
      };
      const [f] = await q<{ makeups: number; late: number; missed: number; recent: number }>(
        `SELECT (SELECT count(*)::int FROM makeup_items m WHERE m.student_id = :sid AND m.state = 'open') AS makeups,
                (SELECT count(*)::int FROM assignment_students a WHERE a.student_id = :sid AND a.due_on < :today AND a.completed_at IS NULL) AS late,
                (SELECT count(*)::int FROM ground_log_current g WHERE g.student_id = :sid AND g.status = 'absent' AND g.occurred_at >= :from AND g.occurred_at < :at) AS missed,
                (SELECT count(*)::int FROM sign_offs so WHERE so.student_id = :sid AND so.amends_id IS NULL AND so.signed_at >= :from AND so.signed_at < :at
                   AND NOT EXISTS (SELECT 1 FROM sign_off_withdrawals w WHERE w.sign_off_id = so.id)) AS recent`,
        { today: dateInZone(at, school.timeZone) },
      );
      assessment = assessWeek({
        makeupsToBook: f?.makeups ?? 0,
        lateAssignments: f?.late ?? 0,
        missedSessions: l.shares_attendance ? (f?.missed ?? 0) : null,
        milestones: f?.recent ?? 0,
      });
    }
    let latestCheck: SponsoredOverview["latestCheck"] = null;
    if (l.shares_outcomes) {
      const [c] = await q<{ occurred_at: Date; outcome: CheckOutcome; items: string }>(
        `SELECT c.occurred_at, c.outcome, string_agg(DISTINCT i.code || ' ' || i.title, ', ' ORDER BY i.code || ' ' || i.title) AS items
           FROM oral_checks c JOIN oral_check_questions oq ON oq.check_id = c.id JOIN syllabus_items i ON i.id = oq.syllabus_item_id
          WHERE c.student_id = :sid
            AND NOT EXISTS (SELECT 1 FROM oral_check_withdrawals x WHERE x.check_id = c.id)
            AND NOT EXISTS (SELECT 1 FROM oral_checks a WHERE a.amends_id = c.id)
          GROUP BY c.id, c.occurred_at, c.outcome ORDER BY c.occurred_at DESC LIMIT 1`,
      );
      if (c) latestCheck = { items: c.items, outcome: c.outcome, on: dateInZone(c.occurred_at, school.timeZone) };
    }
    const hours =
      l.shares_hours && e ? { minutes: await creditedMinutesFor(l.student_id, e.courseId), minimumMinutes: e.minGroundMinutes } : null;
    out.push({
      studentId: l.student_id,
      name: l.name,
      courseTitle: e?.courseTitle ?? null,
      hours,
      milestones,
      latestCheck,
      assessment,
      shares: {
        attendance: l.shares_attendance,
        hours: l.shares_hours,
        milestones: l.shares_progress,
        outcomes: l.shares_outcomes,
        schedule: l.shares_schedule,
      },
      letter: l.stopped ? "stopped-by-you" : l.weekly_letter ? "on" : "stopped-by-student",
      progressLink: l.shares_progress && !!e,
    });
  }
  return out;
}
