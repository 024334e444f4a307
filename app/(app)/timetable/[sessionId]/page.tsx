import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { uuidParam } from "@/lib/http/api";
import { getSession } from "@/db/access/timetable/session-detail";
import { attendanceSheet } from "@/db/access/ground-log/attendance-sheet";
import { getSchool } from "@/db/access/shared/school";
import { schedulingChoices } from "@/db/access/timetable/scheduling-choices";
import { formatDay } from "@/lib/time";
import { hoursLabel } from "@/lib/time";
import { SessionChanges } from "../_components/session-changes";
import { AttendanceSheet } from "../_components/attendance-sheet";

export const metadata: Metadata = { title: "Session" };
export const dynamic = "force-dynamic";

export default async function SessionPage({ params }: { params: Promise<{ sessionId: string }> }) {
  const { sessionId } = await params;
  const user = await requirePagePermission("timetable.view", `/timetable/${sessionId}`);
  if (!uuidParam.safeParse(sessionId).success) notFound();
  const s = await getSession(user, sessionId);
  if (!s) notFound();
  const school = await getSchool(user.schoolId);
  const starts = new Date(s.startsAt);
  const mayRecord = can(user, "attendance.record") && s.canChange;
  const sheet = mayRecord ? await attendanceSheet(s.id) : [];
  const choices = s.canChange && s.status === "scheduled" && !s.ended ? await schedulingChoices(user) : null;
  return (
    <div className="space-y-6">
      <header>
        <p className="text-caption">
          <Link href={`/timetable?week=${s.date}`} className="underline">
            ← Timetable, week of this session
          </Link>
        </p>
        <h1 className="text-display">{s.briefingTitle}</h1>
        <p className="text-ink-soft">
          <span className="num">
            {formatDay(starts, school.timeZone)}, {s.startLocal}–{s.endLocal}
          </span>{" "}
          ({s.durationMinutes} min) · {s.room}
        </p>
        {s.status === "cancelled" && (
          <p className="mt-2 rounded-md border-l-4 border-notyet-600 bg-notyet-100 px-3 py-2" role="status">
            <strong>Cancelled.</strong> {s.cancelReason}
          </p>
        )}
      </header>
      <section className="card" aria-labelledby="about">
        <h2 id="about">About this session</h2>
        <dl className="mt-2 grid gap-x-6 gap-y-1 sm:grid-cols-[max-content_1fr]">
          <dt className="font-semibold">Instructor</dt>
          <dd>{s.instructorName}</dd>
          <dt className="font-semibold">Cohort</dt>
          <dd>{s.cohortName ?? "Individual students"}</dd>
          <dt className="font-semibold">Briefing</dt>
          <dd>
            revision {s.revisionNumber}: {s.objective}
          </dd>
          <dt className="font-semibold">Syllabus items</dt>
          <dd>{s.syllabusItems.length ? s.syllabusItems.map((i) => `${i.code} ${i.title}`).join("; ") : "None listed"}</dd>
          <dt className="font-semibold">Changes</dt>
          <dd className="num">{s.sequence === 0 ? "None" : `${s.sequence} since scheduled`}</dd>
          {s.attendees.length > 0 && (
            <>
              <dt className="font-semibold">Students</dt>
              <dd>{s.attendees.map((a) => a.name).join(", ")}</dd>
            </>
          )}
        </dl>
      </section>
      {mayRecord &&
        s.status === "scheduled" &&
        (s.ended ? (
          <AttendanceSheet sessionId={s.id} sessionMinutes={s.durationMinutes} lines={sheet} />
        ) : (
          <section className="card">
            <h2>Attendance</h2>
            <p className="mt-1 text-ink-soft">
              Attendance is recorded once the session has ended ({s.endLocal}). Each student then earns up to{" "}
              {hoursLabel(s.durationMinutes)} of ground time.
            </p>
          </section>
        ))}
      {choices && (
        <SessionChanges
          session={{
            id: s.id,
            date: s.date,
            time: s.startLocal,
            durationMinutes: s.durationMinutes,
            roomId: s.roomId,
            instructorId: s.instructorId,
            instructorName: s.instructorName,
          }}
          instructors={choices.instructors}
          rooms={choices.roomChoices}
        />
      )}
    </div>
  );
}
