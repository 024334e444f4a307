import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { getSchool } from "../shared/school";
import { dateInZone } from "@/lib/time";
import { now } from "@/lib/clock";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";

export interface RosterStudent {
  studentId: string;
  name: string;
  email: string;
  cohortId: string;
  cohortName: string;
  fromDate: string;
  toDate: string | null;
  /** every membership of this student, oldest first */
  history: { cohortName: string; fromDate: string; toDate: string | null }[];
  sponsors: string[];
}

/**
 * The students of the cohorts the caller leads (with `roster.all`: every cohort), each with the whole
 * membership history, so a new lead instructor sees where the student came from.
 */
export async function listRoster(user: CurrentUser): Promise<RosterStudent[]> {
  const all = can(user, "roster.all");
  const today = dateInZone(now(), (await getSchool(user.schoolId)).timeZone);
  return sequelize.query<RosterStudent>(
    `SELECT p.id AS "studentId", p.name, p.email, c.id AS "cohortId", c.name AS "cohortName", m.from_date AS "fromDate", m.to_date AS "toDate",
            (SELECT json_agg(json_build_object('cohortName', hc.name, 'fromDate', hm.from_date, 'toDate', hm.to_date) ORDER BY hm.from_date)
               FROM cohort_memberships hm JOIN cohorts hc ON hc.id = hm.cohort_id WHERE hm.student_id = p.id) AS history,
            COALESCE((SELECT array_agg(sp.name ORDER BY sp.name) FROM sponsor_links l JOIN people sp ON sp.id = l.sponsor_id WHERE l.student_id = p.id), '{}') AS sponsors
       FROM cohort_memberships m
       JOIN cohorts c ON c.id = m.cohort_id
       JOIN people p ON p.id = m.student_id
      WHERE c.school_id = :schoolId AND m.from_date <= :today AND (m.to_date IS NULL OR m.to_date > :today) AND (:all OR c.lead_instructor_id = :uid)
      ORDER BY c.starts_on, c.name, p.name`,
    { replacements: { schoolId: user.schoolId, all, uid: user.id, today }, type: QueryTypes.SELECT },
  );
}
