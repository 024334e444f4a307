import Link from "next/link";
import { listSessions } from "@/db/access/timetable/list-sessions";
import type { CurrentUser } from "@/lib/auth/session";
import { now } from "@/lib/clock";
import { formatDay } from "@/lib/time";

/** The student's next sessions (This week): scheduled and cancelled ones in the next seven days. */
export async function NextSessions({ user }: { user: CurrentUser }) {
  const from = now();
  const { rows } = await listSessions(
    user,
    { fromInstant: from, toInstant: new Date(from.getTime() + 7 * 24 * 3600_000) },
    { pageSize: 10 },
  );
  return (
    <section className="card" aria-labelledby="next-title">
      <h2 id="next-title">Next sessions</h2>
      {rows.length === 0 ? (
        <p className="mt-2 text-ink-soft">No sessions in the next seven days.</p>
      ) : (
        <ul className="mt-2 divide-y divide-paper-edge" data-testid="next-sessions">
          {rows.map((s) => (
            <li key={s.id} className="py-1">
              <Link href={`/timetable/${s.id}`} className="flex min-h-touch flex-wrap items-center justify-between gap-x-4">
                <span className={`font-medium ${s.status === "cancelled" ? "line-through" : ""}`}>{s.briefingTitle}</span>
                <span className="num text-caption text-ink-soft">
                  {formatDay(s.date)}, {s.startLocal}–{s.endLocal} · {s.room}
                  {s.status === "cancelled" ? " · Cancelled" : ""}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      )}
      <p className="mt-2 text-caption">
        <Link href="/timetable" className="underline">
          Your week on the Timetable
        </Link>{" "}
        ·{" "}
        <Link href="/ground-log" className="underline">
          Your Ground log
        </Link>
      </p>
    </section>
  );
}
