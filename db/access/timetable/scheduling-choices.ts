import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { cohortChoices } from "../directory/cohorts";
import { studentChoices } from "../directory/students";
import { instructorChoices } from "../directory/instructors";
import { can } from "@/lib/auth/can";
import { INSTRUCTOR_PICKER_RULES } from "@/lib/directory/picker";

type Db = { transaction?: Transaction };

/**
 * What the scheduling forms offer: current briefings, instructors, the school's rooms, and cohorts
 * and students listed only while few (else `{ kind: "search" }`: the forms search for them).
 */
export async function schedulingChoices(user: CurrentUser, db: Db = {}) {
  const rep = { replacements: { s: user.schoolId }, type: QueryTypes.SELECT as const, transaction: db.transaction };
  const [briefings, instructors, cohorts, students, rooms] = await Promise.all([
    sequelize.query<{ id: string; title: string; revisionNumber: number; minutes: number }>(
      `SELECT b.id, br.title, br.number AS "revisionNumber",
              COALESCE((SELECT sum((el->>'minutes')::int) FROM jsonb_array_elements(br.elements) el), 0)::int AS minutes
         FROM briefings b JOIN briefing_revisions br ON br.id = b.current_revision_id WHERE b.school_id = :s ORDER BY br.title`,
      rep,
    ),
    instructorChoices(user, "timetable"),
    cohortChoices(user, "timetable"),
    studentChoices(user, "schedule"),
    sequelize.query<{ id: string; name: string; capacity: number | null; active: boolean }>(
      `SELECT id, name, capacity, active FROM rooms WHERE school_id = :s ORDER BY name_key`,
      rep,
    ),
  ]);
  return {
    briefings,
    instructors,
    /** the caller, when they may teach a session (the form's first choice of instructor) */
    self: can(user, INSTRUCTOR_PICKER_RULES.timetable.holders) ? { id: user.id, name: user.name } : null,
    cohorts,
    students,
    /** every room's name, for the Timetable's filters (rooms out of use still have sessions) */
    rooms: rooms.map((r) => r.name),
    /** the rooms a session can be booked in: the school's active rooms */
    roomChoices: rooms.filter((r) => r.active).map(({ id, name, capacity }) => ({ id, name, capacity })),
  };
}
