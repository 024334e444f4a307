import "server-only";
import type { Caller } from "../shared/student-scope";
import { studentsPage, type StudentsFilter, type StudentsPage } from "../shared/students-page";

// The Progress map list, one page at a time: the students (active, with an active enrolment)
// whose Progress map the viewer may open, filtered and paged in SQL by the shared student pager.

export type { ListedStudent } from "../shared/students-page";

/** One page of the students whose Progress map the viewer may open. */
export function progressStudentsPage(
  viewer: Caller,
  filter: StudentsFilter = {},
  opts: { page?: number; pageSize?: number } = {},
): Promise<StudentsPage> {
  return studentsPage(viewer, "progress", filter, opts);
}
