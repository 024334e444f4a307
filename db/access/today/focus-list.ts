import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import { listCohorts } from "../cohorts/list-cohorts";
import { listSponsoredStudents } from "../cohorts/sponsor-links";
import { activeEnrolment } from "../shared/enrolment";

export interface TodayFocusRow {
  id: string;
  primary: string;
  secondary: string;
  href?: string;
}

export type TodayFocusKind = "school" | "teaching" | "learning" | "sponsoring" | "none";

/** Which list the caller's first Today panel gives (the order below). */
export function todayFocusKind(user: Pick<CurrentUser, "roles">): TodayFocusKind {
  if (can(user, "today.school")) return "school";
  if (can(user, "today.teaching")) return "teaching";
  if (can(user, "today.learning")) return "learning";
  if (can(user, "today.sponsoring")) return "sponsoring";
  return "none";
}

/**
 * The list on the Today page that the browser fetches through /api/today, by the caller's first
 * Today panel: the school's (today.school) → every cohort; teaching (today.teaching) → the
 * students of cohorts they lead; learning (today.learning) → the items of their current syllabus
 * stage; sponsoring (today.sponsoring) → their linked students. The Today page shows the
 * sponsor's students in one list only, the richer panel (SponsorToday), so it does not show this
 * list to a caller whose first panel is sponsoring; /api/today still answers with it.
 */
export async function todayFocusList(user: CurrentUser): Promise<{ title: string; rows: TodayFocusRow[] }> {
  if (can(user, "today.school")) {
    const cohorts = await listCohorts(user.schoolId);
    return {
      title: "Cohorts in training",
      rows: cohorts.map((c) => ({
        id: c.id,
        primary: c.name,
        secondary: `${c.courseCode} · lead ${c.leadInstructorName} · ${c.memberCount} students`,
      })),
    };
  }
  if (can(user, "today.teaching")) {
    // one query for every cohort they lead (current members, by cohort then name)
    const members = await sequelize.query<{ id: string; name: string; cohort: string }>(
      `SELECT m.student_id AS id, p.name, c.name AS cohort
         FROM cohorts c JOIN cohort_memberships m ON m.cohort_id = c.id AND m.to_date IS NULL JOIN people p ON p.id = m.student_id
        WHERE c.school_id = :school AND c.lead_instructor_id = :me
        ORDER BY c.starts_on, c.name, p.name`,
      { replacements: { school: user.schoolId, me: user.id }, type: QueryTypes.SELECT },
    );
    return {
      title: "Your students",
      rows: members.map((m) => ({ id: m.id, primary: m.name, secondary: m.cohort, href: `/records/${m.id}` })),
    };
  }
  if (can(user, "today.learning")) {
    const enrolment = await activeEnrolment(user.schoolId, user.id);
    if (!enrolment) return { title: "Your syllabus", rows: [] };
    const items = await sequelize.query<{ id: string; code: string; title: string; stage: string }>(
      `SELECT i.id, i.code, i.title, s.title AS stage FROM syllabus_items i JOIN syllabus_stages s ON s.id = i.stage_id
        WHERE i.revision_id = :rev AND s.position = 1 ORDER BY i.position`,
      { replacements: { rev: enrolment.revisionId }, type: QueryTypes.SELECT },
    );
    return { title: "Your current stage", rows: items.map((i) => ({ id: i.id, primary: `${i.code} ${i.title}`, secondary: i.stage })) };
  }
  if (can(user, "today.sponsoring")) {
    const students = await listSponsoredStudents(user.id);
    return {
      title: "Students you sponsor",
      rows: students.map((s) => ({
        id: s.studentId,
        primary: s.name,
        secondary: s.weeklyLetter ? "Weekly letter on" : "Weekly letter off",
      })),
    };
  }
  return { title: "Nothing to show", rows: [] };
}
