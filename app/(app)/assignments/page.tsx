import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { getCurrentUser } from "@/lib/auth/session";
import { assignmentChoices } from "@/db/access/assignments/choices";
import { staffAssignmentsPage } from "@/db/access/assignments/staff-assignments";
import { listAssignmentsForStudent } from "@/db/access/assignments/student-assignments";
import { schoolToday } from "@/db/access/assignments/school-today";
import { uuidParam } from "@/lib/http/api";
import { AssignmentForm } from "./_components/assignment-form";
import { DoneToggle } from "./_components/done-toggle";
import { StatusBadge } from "./_components/status-badge";
import { formatDueOn } from "./_components/format";
import { WideTable } from "@/components/ui/wide-table";
import { ListPageNav } from "@/components/student-pages";
import { nameListQuerySchema } from "@/lib/records/schema";

export const metadata: Metadata = { title: "Assignments" };
export const dynamic = "force-dynamic";

export default async function AssignmentsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const signedIn = await getCurrentUser();
  // Students complete, staff manage: either permission opens the page.
  const user = await requirePagePermission(
    signedIn && can(signedIn, "assignments.manage") ? "assignments.manage" : "assignments.complete",
    "/assignments",
  );
  const today = await schoolToday(user.schoolId);
  const params = await searchParams;
  const briefingParam = params.briefing;
  const initialBriefingId = typeof briefingParam === "string" && uuidParam.safeParse(briefingParam).success ? briefingParam : undefined;

  if (can(user, "assignments.manage")) {
    // "Set so far" a page at a time (?page=): a school sets assignments every week
    const pageParsed = nameListQuerySchema
      .pick({ page: true })
      .safeParse({ page: typeof params.page === "string" ? params.page : undefined });
    const [{ rows, total, page, pageSize }, choices] = await Promise.all([
      staffAssignmentsPage(user, { page: pageParsed.success ? (pageParsed.data.page ?? 1) : 1 }),
      assignmentChoices(user),
    ]);
    return (
      <div className="space-y-6">
        <h1 className="text-display">Assignments</h1>
        <section className="card" aria-labelledby="h-new">
          <h2 id="h-new">New assignment</h2>
          <div className="mt-3">
            <AssignmentForm choices={choices} initialBriefingId={initialBriefingId} today={today} />
          </div>
        </section>
        <section className="card" aria-labelledby="h-set">
          <h2 id="h-set">Set so far</h2>
          <p className="text-caption text-ink-soft">Newest due date first, 50 a page.</p>
          {!pageParsed.success && (
            <p role="alert" className="mt-2 text-notyet-800">
              Page: {pageParsed.error.issues[0]?.message}. Showing the first page instead.
            </p>
          )}
          <div className="mt-2">
            <ListPageNav
              basePath="/assignments"
              pairs={[]}
              page={page}
              pageSize={pageSize}
              shown={rows.length}
              total={total}
              label="Assignments pages"
              testId="assignments-pages"
              noun="Assignments"
            />
          </div>
          {rows.length === 0 ? (
            <p className="mt-2 text-ink-soft">{page > 1 ? `No assignments on page ${page}.` : "Nothing assigned yet."}</p>
          ) : (
            <div className="mt-2">
              <WideTable label="Assignments table (scrolls sideways on small screens)" more={3}>
                <table className="data-table" data-testid="staff-assignments">
                  <thead>
                    <tr>
                      <th scope="col">What</th>
                      <th scope="col" data-more="">
                        For
                      </th>
                      <th scope="col">Due</th>
                      <th scope="col">Done</th>
                      <th scope="col" data-more="">
                        Overdue
                      </th>
                      <th scope="col" data-more="">
                        Set by
                      </th>
                    </tr>
                  </thead>
                  <tbody>
                    {rows.map((a) => (
                      <tr key={a.id}>
                        <td>
                          <Link href={`/assignments/${a.id}`} className="font-semibold">
                            {a.title}
                          </Link>{" "}
                          <span className="text-caption text-ink-soft">· {a.kind === "briefing" ? "briefing" : "demo"}</span>
                        </td>
                        <td data-more="">{a.target}</td>
                        <td className="num">{formatDueOn(a.dueOn)}</td>
                        <td className="num">
                          {a.done} of {a.students}
                        </td>
                        <td className="num" data-more="">
                          {a.overdue}
                        </td>
                        <td data-more="">{a.assignedByName}</td>
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

  const mine = await listAssignmentsForStudent(user.schoolId, user.id);
  return (
    <div className="space-y-6">
      <h1 className="text-display">Assignments</h1>
      <section className="card" aria-labelledby="h-mine">
        <h2 id="h-mine">Yours</h2>
        {mine.length === 0 ? (
          <p className="mt-2 text-ink-soft">Nothing assigned to you.</p>
        ) : (
          <ul className="mt-2 divide-y divide-paper-edge" data-testid="my-assignments">
            {mine.map((a) => (
              <li key={a.id} id={`a-${a.id}`} className="flex flex-wrap items-center justify-between gap-3 py-3">
                <div className="min-w-0">
                  <p className="font-semibold">
                    {a.kind === "briefing" && a.briefingId ? (
                      <Link href={`/briefings/${a.briefingId}`}>{a.title}</Link>
                    ) : a.demoId ? (
                      <Link href={`/curve-lab/demos/${a.demoId}`}>{a.title}</Link>
                    ) : (
                      a.title
                    )}
                    <span className="text-caption font-normal text-ink-soft"> · {a.kind === "briefing" ? "briefing" : "demo"}</span>
                  </p>
                  <p className="text-caption text-ink-soft">
                    Due {formatDueOn(a.dueOn)} · from {a.assignedByName}
                    {a.note ? ` · “${a.note}”` : ""}
                  </p>
                </div>
                <div className="flex flex-wrap items-center gap-3">
                  <StatusBadge done={a.done} overdue={a.overdue} />
                  <DoneToggle assignmentId={a.id} done={a.done} title={a.title} />
                </div>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
