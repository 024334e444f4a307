import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { cohortChoices, cohortOption } from "../directory/cohorts";
import { TEACHING_ROLES } from "./session-people";

/**
 * What the Timetable's filters offer (week and list views): the teaching staff, the cohorts and
 * every room's name (rooms out of use still have sessions). No students and no briefings: the
 * filters never show them (the scheduling forms read `schedulingChoices`). The cohorts are listed
 * only while few (else the filter is a search picker, and `cohort` is the chosen one's name).
 */
export async function timetableFilterChoices(user: CurrentUser, chosen: { cohort?: string } = {}) {
  const rep = { replacements: { s: user.schoolId, teachers: TEACHING_ROLES }, type: QueryTypes.SELECT as const };
  const [instructors, cohorts, cohort, rooms] = await Promise.all([
    sequelize.query<{ id: string; name: string }>(
      `SELECT id, name FROM people WHERE school_id = :s AND active AND roles && ARRAY[:teachers]::text[] ORDER BY name`,
      rep,
    ),
    cohortChoices(user, "timetable"),
    cohortOption(user, "timetable", chosen.cohort),
    sequelize.query<{ name: string }>(`SELECT name FROM rooms WHERE school_id = :s ORDER BY name_key`, rep),
  ]);
  return { instructors, cohorts, cohort, rooms: rooms.map((r) => r.name) };
}
