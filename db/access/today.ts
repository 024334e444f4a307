import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../index";
import type { CurrentUser } from "@/lib/auth/session";
import { listCohorts, listSponsoredStudents, getActiveEnrolment, listCohortMembers } from "./cohorts";
import { listLockedAccounts } from "./sign-in";

export interface TodayFocusRow {
  id: string;
  primary: string;
  secondary: string;
  href?: string;
}

/**
 * The list on each role's Today page that the browser fetches through /api/today:
 * chief → every cohort; instructor → the students of cohorts they lead;
 * student → the items of their current syllabus stage; sponsor → their linked students.
 */
export async function todayFocusList(user: CurrentUser): Promise<{ title: string; rows: TodayFocusRow[] }> {
  if (user.roles.includes("chief")) {
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
  if (user.roles.includes("instructor")) {
    const cohorts = await listCohorts(user.schoolId, { leadInstructorId: user.id });
    const rows: TodayFocusRow[] = [];
    for (const c of cohorts) {
      for (const m of await listCohortMembers(c.id)) rows.push({ id: m.studentId, primary: m.name, secondary: c.name });
    }
    return { title: "Your students", rows };
  }
  if (user.roles.includes("student")) {
    const enrolment = await getActiveEnrolment(user.id);
    if (!enrolment) return { title: "Your syllabus", rows: [] };
    const items = await sequelize.query<{ id: string; code: string; title: string; stage: string }>(
      `SELECT i.id, i.code, i.title, s.title AS stage FROM syllabus_items i JOIN syllabus_stages s ON s.id = i.stage_id
        WHERE i.revision_id = :rev AND s.position = 1 ORDER BY i.position`,
      { replacements: { rev: enrolment.revisionId }, type: QueryTypes.SELECT },
    );
    return { title: "Your current stage", rows: items.map((i) => ({ id: i.id, primary: `${i.code} ${i.title}`, secondary: i.stage })) };
  }
  if (user.roles.includes("sponsor")) {
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

export async function chiefSummary(user: CurrentUser) {
  const [counts] = await sequelize.query<{ students: number; instructors: number; sponsors: number; cohorts: number }>(
    `SELECT count(*) FILTER (WHERE 'student' = ANY(roles))::int AS students,
            count(*) FILTER (WHERE 'instructor' = ANY(roles))::int AS instructors,
            count(*) FILTER (WHERE 'sponsor' = ANY(roles))::int AS sponsors,
            (SELECT count(*)::int FROM cohorts WHERE school_id = :s) AS cohorts
       FROM people WHERE school_id = :s AND active`,
    { replacements: { s: user.schoolId }, type: QueryTypes.SELECT },
  );
  const locked = await listLockedAccounts(user.schoolId);
  const currency = await sequelize.query<{ name: string; certificateNumber: string; dueOn: string; overdue: boolean }>(
    `SELECT p.name, q.certificate_number AS "certificateNumber",
            (q.recency_on + make_interval(months => q.recency_months))::date AS "dueOn",
            (q.recency_on + make_interval(months => q.recency_months))::date < current_date AS overdue
       FROM instructor_qualifications q JOIN people p ON p.id = q.person_id
      WHERE p.school_id = :s ORDER BY 3`,
    { replacements: { s: user.schoolId }, type: QueryTypes.SELECT },
  );
  return { counts: counts ?? { students: 0, instructors: 0, sponsors: 0, cohorts: 0 }, locked, currency };
}
