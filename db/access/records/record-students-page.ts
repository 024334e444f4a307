import "server-only";
import type { Caller } from "../shared/student-scope";
import { studentsPage, STUDENTS_PAGE_SIZE, type StudentsFilter, type StudentsPage } from "../shared/students-page";

// The Records list, one page at a time: the students whose record the caller may keep, filtered
// and paged in SQL by the shared student pager (db/access/shared/students-page.ts).

export const RECORDS_PAGE_SIZE = STUDENTS_PAGE_SIZE;
export type RecordStudentsFilter = StudentsFilter;

export function recordStudentsPage(
  caller: Caller,
  filter: RecordStudentsFilter = {},
  opts: { page?: number; pageSize?: number } = {},
): Promise<StudentsPage> {
  return studentsPage(caller, "records", filter, opts);
}
