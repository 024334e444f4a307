import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePagePermission } from "@/lib/auth/guard";
import { defaultCourseId, listCoursesWithLatestRevision } from "@/db/access/syllabus/courses";
import { activeEnrolmentsPage } from "@/db/access/syllabus/enrolments";
import { listSyllabusRevisions } from "@/db/access/syllabus/revisions";
import { getSchool } from "@/db/access/shared/school";
import { formatDay } from "@/lib/time";
import { uuidParam } from "@/lib/http/api";
import { MoveEnrolment } from "../_components/move-enrolment";
import { WideTable } from "@/components/ui/wide-table";
import { ListPageNav, QueryProblem } from "@/components/student-pages";
import { enrolmentListQuerySchema, type EnrolmentListQuery } from "@/lib/syllabus/schema";

export const metadata: Metadata = { title: "Syllabus revisions" };
export const dynamic = "force-dynamic";

export default async function SyllabusRevisionsPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePagePermission("syllabus.edit", "/syllabus/revisions");
  const courses = await listCoursesWithLatestRevision(user.schoolId);
  const { course: param, ...listParams } = await searchParams;
  // the enrolment list a page at a time (?name=, ?revision=, ?page=): a course has as many as it has students
  const parsed = enrolmentListQuerySchema.safeParse(
    Object.fromEntries(Object.entries(listParams).filter(([, v]) => typeof v === "string")) as Record<string, string>,
  );
  const q: EnrolmentListQuery = parsed.success ? parsed.data : {};
  const problem = parsed.success ? null : (parsed.error.issues[0] ?? null);
  const courseId = typeof param === "string" && uuidParam.safeParse(param).success ? param : await defaultCourseId(user.schoolId);
  const course = courses.find((c) => c.id === courseId);
  if (!course) notFound();
  const [revisions, { rows: enrolments, total, page, pageSize }, school] = await Promise.all([
    listSyllabusRevisions(user.schoolId, course.id),
    activeEnrolmentsPage(user.schoolId, course.id, { name: q.name, revisionId: q.revision }, { page: q.page ?? 1 }),
    getSchool(user.schoolId),
  ]);
  const choices = revisions.map((r) => ({ id: r.id, number: r.number }));
  const filtered = Boolean(q.name || q.revision);
  const pairs: [string, string][] = [
    ["course", course.id],
    ...(q.name ? ([["name", q.name]] as [string, string][]) : []),
    ...(q.revision ? ([["revision", q.revision]] as [string, string][]) : []),
  ];
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
        <p className="text-caption text-ink-soft">Each student stays on their revision until you move them. 50 a page, by name.</p>
        <form method="get" action="/syllabus/revisions" className="mt-2 flex flex-wrap items-end gap-3" aria-label="Find enrolments">
          <input type="hidden" name="course" value={course.id} />
          <div>
            <label htmlFor="enrolments-name" className="field-label">
              Student&apos;s name contains
            </label>
            <input id="enrolments-name" name="name" type="search" maxLength={100} defaultValue={q.name ?? ""} className="field-input" />
          </div>
          <div>
            <label htmlFor="enrolments-revision" className="field-label">
              On revision
            </label>
            <select id="enrolments-revision" name="revision" defaultValue={q.revision ?? ""} className="field-input">
              <option value="">Any revision</option>
              {revisions.map((r) => (
                <option key={r.id} value={r.id}>
                  Revision {r.number}
                </option>
              ))}
            </select>
          </div>
          <button type="submit" className="btn-primary">
            Show
          </button>
          {filtered && (
            <Link href={`/syllabus/revisions?course=${course.id}`} className="btn-quiet">
              Clear
            </Link>
          )}
        </form>
        <QueryProblem problem={problem} instead="every enrolment" className="mt-2" />
        <div className="mt-2">
          <ListPageNav
            basePath="/syllabus/revisions"
            pairs={pairs}
            page={page}
            pageSize={pageSize}
            shown={enrolments.length}
            total={total}
            label="Enrolments pages"
            testId="enrolments-pages"
            noun="Enrolments"
          />
        </div>
        {enrolments.length === 0 && (
          <p className="mt-2 text-ink-soft">
            {page > 1 ? `No enrolments on page ${page}.` : filtered ? "No enrolment matches." : "No student is enrolled on this course."}
          </p>
        )}
        {enrolments.length > 0 && (
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
        )}
      </section>
    </div>
  );
}
