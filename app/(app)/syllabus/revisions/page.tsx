import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePagePermission } from "@/lib/auth/guard";
import { defaultCourseId, listCoursesWithLatestRevision } from "@/db/access/syllabus/courses";
import { listActiveEnrolments } from "@/db/access/syllabus/enrolments";
import { listSyllabusRevisions } from "@/db/access/syllabus/revisions";
import { getSchool } from "@/db/access/shared/school";
import { formatDay } from "@/lib/time";
import { uuidParam } from "@/lib/http/api";
import { MoveEnrolment } from "../_components/move-enrolment";
import { WideTable } from "@/components/ui/wide-table";

export const metadata: Metadata = { title: "Syllabus revisions" };
export const dynamic = "force-dynamic";

export default async function SyllabusRevisionsPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePagePermission("syllabus.edit", "/syllabus/revisions");
  const courses = await listCoursesWithLatestRevision(user.schoolId);
  const param = (await searchParams).course;
  const courseId = typeof param === "string" && uuidParam.safeParse(param).success ? param : await defaultCourseId(user.schoolId);
  const course = courses.find((c) => c.id === courseId);
  if (!course) notFound();
  const [revisions, enrolments, school] = await Promise.all([
    listSyllabusRevisions(user.schoolId, course.id),
    listActiveEnrolments(user.schoolId, course.id),
    getSchool(user.schoolId),
  ]);
  const choices = revisions.map((r) => ({ id: r.id, number: r.number }));
  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-display">Syllabus revisions</h1>
          <p className="text-ink-soft">
            {course.code} · {course.title}. A revision never changes once something refers to it; a change is a new revision.
          </p>
        </div>
        <Link href={`/syllabus/revisions/new?course=${course.id}`} className="btn-primary">
          Make revision {(course.revisionNumber ?? 0) + 1}
        </Link>
      </header>
      {courses.length > 1 && (
        <nav aria-label="Courses" className="flex flex-wrap gap-2">
          {courses.map((c) => (
            <Link
              key={c.id}
              href={`/syllabus/revisions?course=${c.id}`}
              className={c.id === course.id ? "btn-quiet border-wing-700 bg-wing-50 text-wing-800" : "btn-quiet"}
              aria-current={c.id === course.id ? "page" : undefined}
            >
              {c.code}
              {c.id === course.id ? " (shown)" : ""}
            </Link>
          ))}
        </nav>
      )}
      <section className="card" aria-labelledby="h-revs">
        <h2 id="h-revs">Revisions</h2>
        <div className="mt-2">
          <WideTable label="Revisions table, scrolls sideways" more={4}>
            <table className="data-table" data-testid="syllabus-revisions">
              <thead>
                <tr>
                  <th scope="col">Revision</th>
                  <th scope="col">Effective from</th>
                  <th scope="col">What changed</th>
                  <th scope="col" data-more="">
                    Approved
                  </th>
                  <th scope="col" data-more="">
                    Items
                  </th>
                  <th scope="col" data-more="">
                    Active enrolments
                  </th>
                  <th scope="col" data-more="">
                    Briefing revisions
                  </th>
                </tr>
              </thead>
              <tbody>
                {revisions.map((r) => (
                  <tr key={r.id}>
                    <td className="num font-semibold">
                      {r.number}
                      {r.latest ? " (latest)" : ""}
                    </td>
                    <td className="num">{r.effectiveFrom ? formatDay(r.effectiveFrom) : "—"}</td>
                    <td>
                      {r.changeNote || "—"}{" "}
                      <span className="text-caption text-ink-soft">· made {formatDay(new Date(r.createdAt), school.timeZone)}</span>
                    </td>
                    <td className="num" data-more="">
                      {r.approvedOn ? formatDay(r.approvedOn) : "—"}
                    </td>
                    <td className="num" data-more="">
                      {r.items}
                    </td>
                    <td className="num" data-more="">
                      {r.activeEnrolments}
                    </td>
                    <td className="num" data-more="">
                      {r.briefingRevisions}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </WideTable>
        </div>
      </section>
      <section className="card" aria-labelledby="h-enrol">
        <h2 id="h-enrol">Enrolments and their revision</h2>
        <p className="text-caption text-ink-soft">Each student stays on their revision until you move them.</p>
        <div className="mt-2">
          <WideTable label="Enrolments table, scrolls sideways" more={1}>
            <table className="data-table">
              <thead>
                <tr>
                  <th scope="col">Student</th>
                  <th scope="col">On revision</th>
                  <th scope="col">Move to</th>
                  <th scope="col" data-more="">
                    Enrolled
                  </th>
                </tr>
              </thead>
              <tbody>
                {enrolments.map((e) => (
                  <tr key={e.enrolmentId}>
                    <td>{e.studentName}</td>
                    <td className="num">{e.revisionNumber}</td>
                    <td>
                      <MoveEnrolment
                        enrolmentId={e.enrolmentId}
                        studentName={e.studentName}
                        currentRevisionId={e.revisionId}
                        revisions={choices}
                      />
                    </td>
                    <td className="num" data-more="">
                      {formatDay(e.enrolledOn)}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </WideTable>
        </div>
      </section>
    </div>
  );
}
