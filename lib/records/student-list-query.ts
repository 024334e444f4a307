import type { z } from "zod";
import { nameListQuerySchema, studentListQuerySchema, type NameListQuery, type StudentListQuery } from "./schema";

// The query string of a paged student list (Records, the Progress map list, the Ground log's
// student picker, End of training): the filters when it parses (none when it does not, with the
// first problem to name on the page), and the filter the student pager takes.

export interface StudentListRequest {
  q: StudentListQuery;
  problem: z.core.$ZodIssue | null;
  filter: { cohortId?: string | undefined; cohortName?: string | undefined; name?: string | undefined };
}

/** `params`: the page's search params; `omit`: keys that belong to the page, not to the list (e.g. the chosen student). */
export function parseStudentListQuery(params: Record<string, string | string[] | undefined>, omit: string[] = []): StudentListRequest {
  const raw = Object.fromEntries(Object.entries(params).filter(([k, v]) => !omit.includes(k) && typeof v === "string")) as Record<
    string,
    string
  >;
  const parsed = studentListQuerySchema.safeParse(raw);
  const q: StudentListQuery = parsed.success ? parsed.data : {};
  return {
    q,
    problem: parsed.success ? null : (parsed.error.issues[0] ?? null),
    filter: { cohortId: q.cohort, cohortName: q.cohortName, name: q.name },
  };
}

/** The query string of a list filtered by a part of the name only (the Cohorts page, Accounts and roles). */
export function parseNameListQuery(params: Record<string, string | string[] | undefined>): {
  q: NameListQuery;
  problem: z.core.$ZodIssue | null;
} {
  const raw = Object.fromEntries(Object.entries(params).filter(([, v]) => typeof v === "string")) as Record<string, string>;
  const parsed = nameListQuerySchema.safeParse(raw);
  return { q: parsed.success ? parsed.data : {}, problem: parsed.success ? null : (parsed.error.issues[0] ?? null) };
}
