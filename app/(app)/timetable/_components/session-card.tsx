import Link from "next/link";
import type { SessionRow } from "@/db/access/timetable/list-sessions";

export function SessionCard({ s }: { s: SessionRow }) {
  const cancelled = s.status === "cancelled";
  return (
    <li
      className={`rounded-md border p-2 ${cancelled ? "border-paper-edge bg-paper-deep" : "border-wing-100 bg-wing-50"}`}
      data-testid="session-card"
    >
      <Link href={`/timetable/${s.id}`} className="block min-h-touch no-underline hover:underline">
        <span className="num block text-caption font-semibold text-ink-soft">
          {s.startLocal}–{s.endLocal}
        </span>
        <span className={`block font-semibold text-ink ${cancelled ? "line-through" : ""}`}>{s.briefingTitle}</span>
      </Link>
      <span className="block text-caption text-ink-soft">
        {s.room} · {s.instructorName}
        {s.cohortName ? ` · ${s.cohortName}` : ""}
      </span>
      {cancelled && (
        <span className="mt-1 inline-block rounded bg-notyet-100 px-1 text-caption font-semibold text-notyet-800">Cancelled</span>
      )}
    </li>
  );
}
