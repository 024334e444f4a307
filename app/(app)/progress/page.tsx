import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { progressStudentsPage } from "@/db/access/records/student-list";
import { parseStudentListQuery } from "@/lib/records/student-list-query";
import { StudentFilterForm, StudentPageNav, isFiltered, noStudentsWords, QueryProblem } from "@/components/student-pages";

export const metadata: Metadata = { title: "Progress map" };
export const dynamic = "force-dynamic";

export default async function ProgressIndexPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePagePermission("progress.view", "/progress");
  // who sees no one but themself: straight to the one map, decided before any student is read
  const staff = can(user, "students.all") || can(user, "students.taught");
  if (can(user, "students.own") && !staff && !can(user, "students.sponsored")) redirect(`/progress/${user.id}`);
  const { q, problem, filter } = parseStudentListQuery(await searchParams);
  const { rows: students, total, page, pageSize, cohorts } = await progressStudentsPage(user, filter, { page: q.page ?? 1 });
  // a sponsor with one shared student (and no filter asked for) goes straight to that map
  if (total === 1 && students.length === 1 && !staff && !isFiltered(q)) redirect(`/progress/${students[0]!.id}`);
  const none = (
    <>No Progress map to show{can(user, "students.sponsored") ? ": the students you sponsor have not shared their progress." : "."}</>
  );
  return (
    <div className="space-y-6">
      <h1 className="text-display">Progress map</h1>
      {(staff || total > pageSize || isFiltered(q) || page > 1 || problem) && (
        <StudentFilterForm basePath="/progress" q={q} cohorts={cohorts} idPrefix="progress" />
      )}
      <QueryProblem problem={problem} instead="every student" />
      {students.length === 0 ? (
        <p className="text-ink-soft">{noStudentsWords(q, page, none)}</p>
      ) : (
        <ul className="grid gap-2 sm:grid-cols-2 lg:grid-cols-3" data-testid="progress-students">
          {students.map((s) => (
            <li key={s.id}>
              <Link href={`/progress/${s.id}`} className="btn-quiet w-full flex-wrap justify-start [overflow-wrap:anywhere]">
                {s.name}
                {s.cohortName && <span className="text-caption font-normal text-ink-soft">{s.cohortName}</span>}
              </Link>
            </li>
          ))}
        </ul>
      )}
      <StudentPageNav
        basePath="/progress"
        q={q}
        page={page}
        pageSize={pageSize}
        shown={students.length}
        total={total}
        label="Progress map pages"
        testId="progress-pages"
      />
    </div>
  );
}
