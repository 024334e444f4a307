import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { recordStudentsPage } from "@/db/access/records/record-students-page";
import { listCheckInstructors } from "@/db/access/records/stage-checks";
import { parseStudentListQuery } from "@/lib/records/student-list-query";
import { StudentFilterForm, StudentPageNav, noStudentsWords, QueryProblem } from "@/components/student-pages";
import { DesignateToggle } from "./_components/designate-toggle";

export const metadata: Metadata = { title: "Records" };
export const dynamic = "force-dynamic";

export default async function RecordsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("checks.record", "/records");
  const { q, problem, filter } = parseStudentListQuery(await searchParams);
  const { rows: students, total, page, pageSize, cohorts } = await recordStudentsPage(user, filter, { page: q.page ?? 1 });
  const byCohort = new Map<string, typeof students>();
  for (const s of students) byCohort.set(s.cohortName ?? "No cohort", [...(byCohort.get(s.cohortName ?? "No cohort") ?? []), s]);
  const instructors = can(user, "stagechecks.designate") ? await listCheckInstructors(user.schoolId) : [];
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
      {instructors.length > 0 && (
        <section className="card" aria-labelledby="check-instructors">
          <h2 id="check-instructors">Check instructors</h2>
          <p className="text-caption text-ink-soft">
            Designated check instructors may conduct stage checks, except for students they lead.
          </p>
          <ul className="mt-2 space-y-2">
            {instructors.map((i) => (
              <li key={i.id} className="flex flex-wrap items-center justify-between gap-2">
                <span>{i.name}</span>
                <DesignateToggle personId={i.id} name={i.name} designated={i.check_instructor} />
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
