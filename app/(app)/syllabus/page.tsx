import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { getSyllabusRevision } from "@/db/access/syllabus/revisions";
import { listCoursesWithLatestRevision } from "@/db/access/syllabus/courses";
import { activeEnrolment } from "@/db/access/shared/enrolment";
import { WideTable } from "@/components/ui/wide-table";
import { formatDay } from "@/lib/time";

export const metadata: Metadata = { title: "Syllabus" };
export const dynamic = "force-dynamic";

const LEVEL_LABEL = { rote: "Rote", understanding: "Understanding", application: "Application", correlation: "Correlation" } as const;

export default async function SyllabusPage() {
  const user = await requirePagePermission("syllabus.view", "/syllabus");
  let revisionIds: string[];
  if (can(user, "syllabus.all")) {
    revisionIds = (await listCoursesWithLatestRevision(user.schoolId)).flatMap((c) => (c.revisionId ? [c.revisionId] : []));
  } else {
    const e = await activeEnrolment(user.schoolId, user.id);
    revisionIds = e ? [e.revisionId] : [];
  }
  const revisions = (await Promise.all(revisionIds.map((id) => getSyllabusRevision(user.schoolId, id)))).filter((r) => r !== null);
  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-end justify-between gap-3">
        <h1 className="text-display">Syllabus</h1>
        {can(user, "syllabus.edit") && (
          <Link href="/syllabus/revisions" className="btn-quiet">
            Revisions and enrolments
          </Link>
        )}
      </header>
      {revisions.length === 0 && <p className="text-ink-soft">No syllabus to show.</p>}
      {revisions.map((rev) => (
        <section key={rev.revisionId} className="space-y-4">
          <header>
            <h2>
              {rev.course.code} · {rev.course.title}
            </h2>
            <p className="text-caption text-ink-soft">
              Revision {rev.number} · approved {rev.approvedOn ? formatDay(rev.approvedOn) : "—"} · effective from{" "}
              {rev.effectiveFrom ? formatDay(rev.effectiveFrom) : "—"} · minimum ground time {rev.course.minGroundMinutes / 60} h
            </p>
          </header>
          {rev.stages.map((s) => (
            <section key={s.id} className="card" aria-labelledby={`st-${s.id}`}>
              <h3 id={`st-${s.id}`} className="font-semibold">
                {s.code} · {s.title}
              </h3>
              <div className="mt-2">
                <WideTable label={`${s.code} items`} more={1}>
                  <table className="data-table">
                    <thead>
                      <tr>
                        <th scope="col">Item</th>
                        <th scope="col">Level</th>
                        <th scope="col">Objective</th>
                        <th scope="col" data-more="">
                          Completion standard
                        </th>
                      </tr>
                    </thead>
                    <tbody>
                      {s.items.map((i) => (
                        <tr key={i.id}>
                          <td>
                            <span className="num font-semibold">{i.code}</span> {i.title}
                          </td>
                          <td>{LEVEL_LABEL[i.requiredLevel]}</td>
                          <td>{i.objective}</td>
                          <td data-more="">{i.completionStandard}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </WideTable>
              </div>
            </section>
          ))}
        </section>
      ))}
    </div>
  );
}
