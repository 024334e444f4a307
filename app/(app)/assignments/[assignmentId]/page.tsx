import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePagePermission } from "@/lib/auth/guard";
import { assignmentCompletion } from "@/db/access/assignments/staff-assignments";
import { getSchool } from "@/db/access/shared/school";
import { formatDayTime } from "@/lib/time";
import { uuidParam } from "@/lib/http/api";
import { StatusBadge } from "../_components/status-badge";
import { formatDueOn } from "../_components/format";
import { ScrollArea } from "@/components/ui/scroll-area";

export const metadata: Metadata = { title: "Assignment completion" };
export const dynamic = "force-dynamic";

export default async function AssignmentPage({ params }: { params: Promise<{ assignmentId: string }> }) {
  const { assignmentId } = await params;
  const user = await requirePagePermission("assignments.manage", `/assignments/${assignmentId}`);
  if (!uuidParam.safeParse(assignmentId).success) notFound();
  const data = await assignmentCompletion(user, assignmentId);
  if (!data) notFound();
  const school = await getSchool(user.schoolId);
  const a = data.assignment;
  return (
    <div className="space-y-6">
      <header>
        <p className="text-caption font-semibold uppercase tracking-wide text-ink-soft">
          Assignment · {a.kind === "briefing" ? "briefing" : "demo"}
        </p>
        <h1 className="text-display">
          {a.kind === "briefing" && a.briefingId ? <Link href={`/briefings/${a.briefingId}`}>{a.title}</Link> : a.title}
        </h1>
        <p className="text-ink-soft">
          For {a.target} · due {formatDueOn(a.dueOn)} · set by {a.assignedByName}
        </p>
      </header>
      <section className="card" aria-labelledby="h-completion">
        <h2 id="h-completion">
          Completion{" "}
          <span className="text-caption font-normal text-ink-soft">
            · <span className="num">{a.done}</span> of <span className="num">{a.students}</span> done
          </span>
        </h2>
        <ScrollArea label="Completion table (scrolls sideways on small screens)" className="mt-2">
          <table className="data-table" data-testid="completion-table">
            <thead>
              <tr>
                <th scope="col">Student</th>
                <th scope="col">State</th>
                <th scope="col">Marked done</th>
              </tr>
            </thead>
            <tbody>
              {data.rows.map((r) => (
                <tr key={r.studentId}>
                  <td>{r.name}</td>
                  <td>
                    <StatusBadge done={r.done} overdue={r.overdue} />
                  </td>
                  <td className="num">{r.completedAt ? formatDayTime(new Date(r.completedAt), school.timeZone) : "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollArea>
      </section>
    </div>
  );
}
