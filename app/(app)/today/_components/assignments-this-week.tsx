import Link from "next/link";
import { addDays, format, parseISO } from "date-fns";
import type { CurrentUser } from "@/lib/auth/session";
import { formatDay } from "@/lib/time";
import { listAssignmentsForStudent } from "@/db/access/assignments/student-assignments";
import { schoolToday } from "@/db/access/assignments/school-today";

/** Inside the student's "This week" card: assignments not yet done that are overdue or due within seven days. */
export async function AssignmentsThisWeek({ user }: { user: CurrentUser }) {
  const today = await schoolToday(user.schoolId);
  const weekEnd = format(addDays(parseISO(today), 7), "yyyy-MM-dd");
  const open = (await listAssignmentsForStudent(user.schoolId, user.id, { to: weekEnd })).filter((a) => !a.done);
  return (
    <div className="mt-4" data-testid="week-assignments">
      <h3 className="text-caption font-semibold text-ink-soft">Assignments due</h3>
      {open.length === 0 ? (
        <p className="text-ink-soft">Nothing due this week.</p>
      ) : (
        <ul className="mt-1 space-y-1">
          {open.map((a) => (
            <li key={a.id} className="flex flex-wrap items-baseline gap-x-2">
              <Link
                href={a.kind === "briefing" && a.briefingId ? `/briefings/${a.briefingId}` : `/assignments#a-${a.id}`}
                className="font-medium"
              >
                {a.title}
              </Link>
              <span className={a.overdue ? "text-caption font-semibold text-notyet-800" : "text-caption text-ink-soft"}>
                {a.overdue ? "Overdue: " : "Due "}
                {formatDay(a.dueOn)}
              </span>
            </li>
          ))}
        </ul>
      )}
      <Link href="/assignments" className="mt-1 inline-flex min-h-touch items-center text-caption">
        All your assignments
      </Link>
    </div>
  );
}
