import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission } from "@/lib/auth/guard";
import { completionOverview } from "@/db/access/completion/completion-overview";
import { END_KIND_WORDS } from "@/lib/completion/statements";
import { DataTable } from "@/components/ui/data-table";
import { formatDay } from "@/lib/time";
import { parseStudentListQuery } from "@/lib/records/student-list-query";
import { StudentFilterForm, StudentPageNav, isFiltered, noStudentsWords, QueryProblem } from "@/components/student-pages";

export const metadata: Metadata = { title: "End of training" };
export const dynamic = "force-dynamic";

export default async function CompletionPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("records.certify", "/completion");
  const { q, problem, filter } = parseStudentListQuery(await searchParams);
  const { inTraining, inTrainingTotal, page, pageSize, cohorts, ended } = await completionOverview(user, filter, { page: q.page ?? 1 });
  return (
    <div className="max-w-5xl space-y-6">
      <div>
        <h1 className="text-display">End of training</h1>
        <p className="text-ink-soft">
          Graduate a student, end their training or record their transfer to another school, and certify their record. A student can also
          leave their cohort and stay on the course.
        </p>
      </div>
      <section className="card" aria-labelledby="in-training">
        <h2 id="in-training">In training</h2>
        {(inTrainingTotal > pageSize || isFiltered(q) || page > 1 || problem) && (
          <div className="mt-2">
            <StudentFilterForm basePath="/completion" q={q} cohorts={cohorts} idPrefix="completion" bare />
          </div>
        )}
        <QueryProblem problem={problem} instead="every student" className="mt-2" />
        {inTraining.length === 0 ? (
          <p className="mt-2 text-ink-soft">{noStudentsWords(q, page, "Nobody is in training.")}</p>
        ) : (
          <div className="mt-2">
            <DataTable
              label="Students in training, scrolls sideways"
              testId="in-training"
              columns={[{ header: "Student" }, { header: "Cohort" }, { header: "Enrolled", more: true }]}
            >
              {inTraining.map((s) => (
                <tr key={s.studentId}>
                  <td>
                    <Link className="underline" href={`/completion/${s.studentId}`}>
                      {s.name}
                    </Link>{" "}
                    <span className="text-caption text-ink-soft">{s.courseCode}</span>
                  </td>
                  <td>{s.cohortName ?? "no cohort"}</td>
                  <td className="num" data-more="">
                    {formatDay(s.enrolledOn)}
                  </td>
                </tr>
              ))}
            </DataTable>
          </div>
        )}
        <div className="mt-2">
          <StudentPageNav
            basePath="/completion"
            q={q}
            page={page}
            pageSize={pageSize}
            shown={inTraining.length}
            total={inTrainingTotal}
            label="Students in training, pages"
            testId="in-training-pages"
          />
        </div>
      </section>
      <section className="card" aria-labelledby="ended">
        <h2 id="ended">Training ended</h2>
        {ended.length === 0 ? (
          <p className="mt-2 text-ink-soft">No training has ended yet.</p>
        ) : (
          <div className="mt-2">
            <DataTable
              label="Training ended, scrolls sideways"
              testId="ended"
              columns={[{ header: "Student" }, { header: "Ended" }, { header: "Reason", more: true }]}
            >
              {ended.map((s) => (
                <tr key={`${s.studentId}-${s.endedOn}`}>
                  <td>
                    <Link className="underline" href={`/completion/${s.studentId}`}>
                      {s.name}
                    </Link>{" "}
                    <span className="text-caption text-ink-soft">{s.courseCode}</span>
                    {s.graduated && (
                      <>
                        <br />
                        <a className="text-caption underline" href={`/api/records/${s.studentId}/certificate`}>
                          Graduation certificate (PDF)
                        </a>
                      </>
                    )}
                  </td>
                  <td>
                    {s.endKind ? END_KIND_WORDS[s.endKind] : "Ended"}, <span className="num">{formatDay(s.endedOn)}</span>
                    {!s.certified && <span className="block text-caption text-ink-soft">record not certified</span>}
                  </td>
                  <td data-more="">{s.reason ?? "—"}</td>
                </tr>
              ))}
            </DataTable>
          </div>
        )}
      </section>
    </div>
  );
}
