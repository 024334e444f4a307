import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { recordStudentsPage } from "@/db/access/records/record-students-page";
import { checkInstructorsOverview } from "@/db/access/records/stage-checks";
import { parseStudentListQuery } from "@/lib/records/student-list-query";
import { StudentFilterForm, StudentPageNav, noStudentsWords, QueryProblem } from "@/components/student-pages";
import { DesignateToggle } from "./_components/designate-toggle";
import { DesignateFinder } from "./_components/designate-finder";

export const metadata: Metadata = { title: "Records" };
export const dynamic = "force-dynamic";

export default async function RecordsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("checks.record", "/records");
  const { q, problem, filter } = parseStudentListQuery(await searchParams);
  const { rows: students, total, page, pageSize, cohorts } = await recordStudentsPage(user, filter, { page: q.page ?? 1 });
  const byCohort = new Map<string, typeof students>();
  for (const s of students) byCohort.set(s.cohortName ?? "No cohort", [...(byCohort.get(s.cohortName ?? "No cohort") ?? []), s]);
  const checkers = can(user, "stagechecks.designate") ? await checkInstructorsOverview(user.schoolId) : null;
  // past a list's worth of instructors (or of designated ones), the others are found by name
  const findByName = !!checkers && (checkers.others.kind === "search" || checkers.designatedTotal > checkers.designated.length);
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-display">Records</h1>
        <p className="text-ink-soft">Choose a student to record an oral check, sign off items or conduct a stage check.</p>
      </header>
      <StudentFilterForm basePath="/records" q={q} cohorts={cohorts} idPrefix="records" />
      <QueryProblem problem={problem} instead="every student" />
      {students.length === 0 && <p className="text-ink-soft">{noStudentsWords(q, page)}</p>}
      {[...byCohort.entries()].map(([cohort, list]) => (
        <section key={cohort} className="card" aria-labelledby={`c-${cohort}`}>
          <h2 id={`c-${cohort}`}>{cohort}</h2>
          <ul className="mt-2 grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
            {list.map((s) => (
              <li key={s.id}>
                <Link href={`/records/${s.id}`} className="btn-quiet w-full justify-start" data-testid="record-student">
                  {s.name}
                </Link>
              </li>
            ))}
          </ul>
        </section>
      ))}
      <StudentPageNav
        basePath="/records"
        q={q}
        page={page}
        pageSize={pageSize}
        shown={students.length}
        total={total}
        label="Records pages"
        testId="records-pages"
      />
      {checkers && (checkers.designatedTotal > 0 || checkers.others.kind === "search" || checkers.others.rows.length > 0) && (
        <section className="card space-y-3" aria-labelledby="check-instructors" data-testid="check-instructors">
          <div>
            <h2 id="check-instructors">Check instructors</h2>
            <p className="text-caption text-ink-soft">
              Designated check instructors may conduct stage checks, except for students they lead. Only active instructors with a
              qualification in force can be designated.
            </p>
          </div>
          <div>
            <h3 className="font-semibold">Designated ({checkers.designatedTotal})</h3>
            {checkers.designatedTotal === 0 ? (
              <p className="text-caption text-ink-soft">No one is designated yet.</p>
            ) : (
              <ul className="mt-1 space-y-2">
                {checkers.designated.map((i) => (
                  <li key={i.id} className="flex flex-wrap items-center justify-between gap-2">
                    <span>{i.name}</span>
                    <DesignateToggle personId={i.id} name={i.name} designated showState={false} />
                  </li>
                ))}
              </ul>
            )}
            {checkers.designatedTotal > checkers.designated.length && (
              <p className="text-caption text-ink-soft">The first {checkers.designated.length} by name; find any other by name below.</p>
            )}
          </div>
          <div>
            <h3 className="font-semibold">{findByName ? "Any instructor" : "Not designated"}</h3>
            {findByName || checkers.others.kind === "search" ? (
              <DesignateFinder />
            ) : checkers.others.rows.length === 0 ? (
              <p className="text-caption text-ink-soft">Every qualified instructor is designated.</p>
            ) : (
              <ul className="mt-1 space-y-2">
                {checkers.others.rows.map((i) => (
                  <li key={i.id} className="flex flex-wrap items-center justify-between gap-2">
                    <span>{i.name}</span>
                    <DesignateToggle personId={i.id} name={i.name} designated={false} showState={false} />
                  </li>
                ))}
              </ul>
            )}
          </div>
        </section>
      )}
    </div>
  );
}
