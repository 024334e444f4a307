import Link from "next/link";
import { sessionsAwaitingAttendance } from "@/db/access/today/teaching-week";
import type { CurrentUser } from "@/lib/auth/session";
import { formatDay } from "@/lib/time";

/** Sessions the instructor taught that have ended with no attendance recorded: asked for as soon as a session ends. */
export async function AttendanceDue({ user }: { user: CurrentUser }) {
  const rows = await sessionsAwaitingAttendance(user);
  return (
    <section className="card" aria-labelledby="att-due-title">
      <h2 id="att-due-title">Attendance to record</h2>
      {rows.length === 0 ? (
        <p className="mt-2 text-ink-soft">Nothing waiting: every session you taught that has ended has its attendance.</p>
      ) : (
        <ul className="mt-2 divide-y divide-paper-edge" data-testid="attendance-due">
          {rows.map((s) => (
            <li key={s.id} className="py-1">
              <Link href={`/timetable/${s.id}`} className="flex min-h-touch flex-wrap items-center justify-between gap-x-4">
                <span className="font-medium">{s.briefingTitle}</span>
                <span className="num text-caption text-ink-soft">
                  {formatDay(s.date)}, {s.startLocal}–{s.endLocal} · {s.cohortName ?? `${s.attendeeCount} students`} · {s.room}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
