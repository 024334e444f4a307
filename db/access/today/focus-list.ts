import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import { cohortsTop } from "../cohorts/list-cohorts";
import { listSponsoredStudents } from "../cohorts/sponsor-links";
import { activeEnrolment } from "../shared/enrolment";
import { cachedSummary } from "../shared/summary-cache";

export interface TodayFocusRow {
  id: string;
  primary: string;
  secondary: string;
  href?: string;
}

export interface TodayFocus {
  title: string;
  /** at most FOCUS_SHOWN rows (a sponsor's or student's list is short by nature) */
  rows: TodayFocusRow[];
  /** how many there are in all */
  total: number;
  /** where the whole list is, when some are left out */
  more?: { href: string; label: string };
}

/** How many cohorts or students the Today list names; the rest are counted, with a link to the paged list. */
export const FOCUS_SHOWN = 10;

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
 * list to a caller whose first panel is sponsoring; /api/today still answers with it. The school's
 * and the teaching lists name the first FOCUS_SHOWN and count the rest (one query each), with a
 * link to the list that holds them all. Kept per caller while the school's records are unchanged
 * (cachedSummary).
 */
export async function todayFocusList(user: CurrentUser): Promise<TodayFocus> {
  // counted over every cohort or every student taught: kept per caller while the records are unchanged
  const key = `today-focus:${user.id}:${[...user.roles].sort().join(",")}`;
  return cachedSummary(
    user.schoolId,
    key,
    () => computeFocusList(user),
    (v) => v as TodayFocus,
  );
}

async function computeFocusList(user: CurrentUser): Promise<TodayFocus> {
  if (can(user, "today.school")) {
    const { rows: cohorts, total } = await cohortsTop(user.schoolId, {}, FOCUS_SHOWN);
    return {
      title: "Cohorts in training",
      rows: cohorts.map((c) => ({
        id: c.id,
        primary: c.name,
        secondary: `${c.courseCode} · lead ${c.leadInstructorName} · ${c.memberCount} students`,
      })),
      total,
      ...(total > cohorts.length && can(user, "cohorts.manage") ? { more: { href: "/cohorts", label: "Every cohort" } } : {}),
    };
  }
  if (can(user, "today.teaching")) {
    // one query for every cohort they lead (current members, by cohort then name), the first
    // FOCUS_SHOWN of them and the number in all
    const members = await sequelize.query<{ id: string; name: string; cohort: string; total: number }>(
      `SELECT m.student_id AS id, p.name, c.name AS cohort, count(*) OVER ()::int AS total
         FROM cohorts c JOIN cohort_memberships m ON m.cohort_id = c.id AND m.to_date IS NULL JOIN people p ON p.id = m.student_id
        WHERE c.school_id = :school AND c.lead_instructor_id = :me
        ORDER BY c.starts_on, c.name, p.name, p.id LIMIT :limit`,
      { replacements: { school: user.schoolId, me: user.id, limit: FOCUS_SHOWN }, type: QueryTypes.SELECT },
    );
    const total = members[0]?.total ?? 0;
    return {
      title: "Your students",
      rows: members.map((m) => ({ id: m.id, primary: m.name, secondary: m.cohort, href: `/records/${m.id}` })),
      total,
      ...(total > members.length && can(user, "checks.record")
        ? { more: { href: "/records", label: "Every student you teach, in Records" } }
        : {}),
    };
  }
  if (can(user, "today.learning")) {
    const enrolment = await activeEnrolment(user.schoolId, user.id);
    if (!enrolment) return { title: "Your syllabus", rows: [], total: 0 };
    const items = await sequelize.query<{ id: string; code: string; title: string; stage: string }>(
      `SELECT i.id, i.code, i.title, s.title AS stage FROM syllabus_items i JOIN syllabus_stages s ON s.id = i.stage_id
        WHERE i.revision_id = :rev AND s.position = 1 ORDER BY i.position`,
      { replacements: { rev: enrolment.revisionId }, type: QueryTypes.SELECT },
    );
    return {
      title: "Your current stage",
      rows: items.map((i) => ({ id: i.id, primary: `${i.code} ${i.title}`, secondary: i.stage })),
      total: items.length,
    };
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
      total: students.length,
    };
  }
  return { title: "Nothing to show", rows: [], total: 0 };
}
