import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { cohortChoices, cohortOption } from "../directory/cohorts";
import { instructorChoices, instructorOption } from "../directory/instructors";

/**
 * What the Timetable's filters offer (week and list views): the teaching staff, the cohorts and
 * every room's name (rooms out of use still have sessions). No students and no briefings: the
 * filters never show them (the scheduling forms read `schedulingChoices`). The staff and the cohorts
 * are listed only while few (else the filter is a search picker, and `instructor` / `cohort` name the chosen ones).
 */
export async function timetableFilterChoices(user: CurrentUser, chosen: { cohort?: string; instructor?: string } = {}) {
  const rep = { replacements: { s: user.schoolId }, type: QueryTypes.SELECT as const };
  const [instructors, instructor, cohorts, cohort, rooms] = await Promise.all([
    instructorChoices(user, "timetable"),
    instructorOption(user, "timetable", chosen.instructor),
    cohortChoices(user, "timetable"),
    cohortOption(user, "timetable", chosen.cohort),
    sequelize.query<{ name: string }>(`SELECT name FROM rooms WHERE school_id = :s ORDER BY name_key`, rep),
  ]);
  return { instructors, instructor, cohorts, cohort, rooms: rooms.map((r) => r.name) };
}
