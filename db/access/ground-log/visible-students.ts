import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { accessTo } from "../shared/student-scope";
import { studentsPage, type StudentsFilter, type StudentsPage } from "../shared/students-page";
import type { CurrentUser } from "@/lib/auth/session";

/** Whether the caller may see this student's Ground log (the "groundlog" scope: staff, self, a sponsor the student shares hours and attendance with). */
export async function mayViewGroundLog(user: CurrentUser, studentId: string): Promise<boolean> {
  return (await accessTo(user, studentId, "groundlog")) !== null;
}

/**
 * One page of the students whose Ground log the caller may open from the Ground log page (every
 * student account the scope allows, ended trainings too), filtered and paged in SQL by the shared
 * student pager; staff also see each one's current cohort.
 */
export function groundLogStudentsPage(
  user: CurrentUser,
  filter: StudentsFilter = {},
  opts: { page?: number; pageSize?: number } = {},
): Promise<StudentsPage> {
  return studentsPage(user, "groundlog", filter, { ...opts, who: "accounts", cohortToStaffOnly: true });
}

/** The name of a student of the caller's school (asked once the Ground log scope has allowed them). */
export async function groundLogStudentName(user: CurrentUser, studentId: string): Promise<string | null> {
  const [row] = await sequelize.query<{ name: string }>(`SELECT name FROM people WHERE id = :id AND school_id = :school`, {
    replacements: { id: studentId, school: user.schoolId },
    type: QueryTypes.SELECT,
  });
  return row?.name ?? null;
}
