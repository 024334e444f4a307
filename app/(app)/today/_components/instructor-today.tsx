import Link from "next/link";
import { cohortsTop } from "@/db/access/cohorts/list-cohorts";
import { FOCUS_SHOWN } from "@/db/access/today/focus-list";
import { teachingWeek } from "@/db/access/today/teaching-week";
import type { OralCheckDue } from "@/db/access/today/oral-checks-due";
import type { SessionRow } from "@/db/access/timetable/list-sessions";
import type { CurrentUser } from "@/lib/auth/session";
import { formatDay } from "@/lib/time";

function SessionList({ rows, withDay, testId }: { rows: SessionRow[]; withDay: boolean; testId: string }) {
  return (
    <ul className="mt-2 divide-y divide-paper-edge" data-testid={testId}>
      {rows.map((s) => (
        <li key={s.id} className="py-1">
          <Link href={`/timetable/${s.id}`} className="flex min-h-touch flex-wrap items-center justify-between gap-x-4">
            <span className="font-medium">{s.briefingTitle}</span>
            <span className="num text-caption text-ink-soft">
              {withDay ? `${formatDay(s.date)}, ` : ""}
              {s.startLocal}–{s.endLocal} · {s.cohortName ?? `${s.attendeeCount} students`} · {s.room}
            </span>
          </Link>
        </li>
      ))}
    </ul>
  );
}

/** Students shown before the rest fold away: the list is a reminder, not the register. */
const ORAL_CHECKS_SHOWN = 5;

function OralCheckDueRow({ d, timeZone }: { d: OralCheckDue; timeZone: string }) {
  return (
    <li className="flex min-h-touch flex-wrap items-center justify-between gap-x-4 gap-y-1 py-1">
      <span className="min-w-0 [overflow-wrap:anywhere]">
        <Link href={`/records/${d.studentId}`} className="font-medium underline">
          {d.studentName}
        </Link>{" "}
        <span className="text-caption text-ink-soft">
          · {d.items.map((i) => `${i.code} ${i.title}`).join(", ")} · last taught {formatDay(d.lastTaughtAt, timeZone)}
        </span>
      </span>
      <Link href={`/records/${d.studentId}#new-check`} className="btn-quiet">
        Record the check<span className="sr-only"> of {d.studentName}</span>
      </Link>
    </li>
  );
}

export async function InstructorToday({ user }: { user: CurrentUser }) {
  const [{ rows: cohorts, total: cohortsTotal }, week] = await Promise.all([
    cohortsTop(user.schoolId, { leadInstructorId: user.id }, FOCUS_SHOWN),
    teachingWeek(user),
  ]);
  const oralFolded = week.oralChecksDue.length - ORAL_CHECKS_SHOWN;
  return (
    <>
      <section className="card" aria-labelledby="teaching-today-title">
        <h2 id="teaching-today-title">Your sessions today</h2>
        {week.todaySessions.length === 0 ? (
          <p className="mt-2 text-ink-soft">No session of yours today.</p>
        ) : (
          <SessionList rows={week.todaySessions} withDay={false} testId="sessions-today" />
        )}
        <h3 className="mt-4 font-semibold">
          This week{" "}
          <span className="num text-caption font-normal text-ink-soft">
            ({formatDay(week.weekFrom)} to {formatDay(week.weekTo)})
          </span>
        </h3>
        {week.weekSessions.length === 0 ? (
          <p className="mt-1 text-ink-soft">No other session of yours this week.</p>
        ) : (
          <SessionList rows={week.weekSessions} withDay testId="sessions-week" />
        )}
      </section>
      <section className="card" aria-labelledby="checks-due-title">
        <h2 id="checks-due-title">Checks due</h2>
        <h3 className="mt-2 font-semibold">Oral checks</h3>
        {week.oralChecksDue.length === 0 ? (
          <p className="mt-1 text-ink-soft">Every item taught to your students has a satisfactory oral check.</p>
        ) : (
          <>
            <p className="mt-1 text-caption text-ink-soft">
              Items taught in a session the student attended, with no oral check meeting the standard yet.
            </p>
            <ul className="mt-1 divide-y divide-paper-edge" data-testid="oral-checks-due">
              {week.oralChecksDue.slice(0, ORAL_CHECKS_SHOWN).map((d) => (
                <OralCheckDueRow key={d.studentId} d={d} timeZone={week.timeZone} />
              ))}
            </ul>
            {week.oralChecksDue.length > ORAL_CHECKS_SHOWN && (
              <details className="mt-1">
                <summary className="min-h-touch cursor-pointer py-2 underline">
                  {oralFolded} more student{oralFolded === 1 ? "" : "s"} with items ready for an oral check
                </summary>
                <ul className="divide-y divide-paper-edge" data-testid="oral-checks-due-more">
                  {week.oralChecksDue.slice(ORAL_CHECKS_SHOWN).map((d) => (
                    <OralCheckDueRow key={d.studentId} d={d} timeZone={week.timeZone} />
                  ))}
                </ul>
              </details>
            )}
            {week.oralChecksDueTotal > week.oralChecksDue.length && (
              <p className="mt-1 text-caption text-ink-soft" data-testid="oral-checks-due-count">
                <span className="num">{week.oralChecksDueTotal.toLocaleString("en-GB")}</span> students have items ready in all; the first{" "}
                <span className="num">{week.oralChecksDue.length}</span> by name are listed.{" "}
                <Link href="/records" className="inline-block min-h-touch py-2 underline">
                  Every student in Records
                </Link>
              </p>
            )}
          </>
        )}
        <h3 className="mt-4 font-semibold">Stage checks</h3>
        {week.checksDueTotal === 0 ? (
          <p className="mt-1 text-ink-soft">No student you teach has a stage ready for its check.</p>
        ) : (
          <>
            {week.checksDueTotal > week.checksDue.length && (
              <p className="mt-1 text-caption text-ink-soft" data-testid="checks-due-count">
                <span className="num">{week.checksDueTotal.toLocaleString("en-GB")}</span> stages ready for their check; the{" "}
                {week.checksDue.length} waiting longest:
              </p>
            )}
            <ul className="mt-2 divide-y divide-paper-edge" data-testid="checks-due">
              {week.checksDue.map((c) => (
                <li key={`${c.studentId}-${c.stageCode}`} className="flex min-h-touch flex-wrap items-center justify-between gap-x-4 py-1">
                  <Link href={`/records/${c.studentId}`} className="font-medium underline">
                    {c.studentName}
                  </Link>
                  <span className="text-caption text-ink-soft">
                    stage {c.stageCode} ready for its check
                    {c.since ? ` · every item signed off by ${formatDay(c.since, week.timeZone)}` : ""}
                  </span>
                </li>
              ))}
            </ul>
            {week.checksDueTotal > week.checksDue.length && (
              <Link href="/records" className="mt-1 inline-block min-h-touch py-2 text-caption underline">
                Every student in Records
              </Link>
            )}
          </>
        )}
      </section>
      <section className="card" aria-labelledby="lead-title">
        <h2 id="lead-title">Cohorts you lead</h2>
        {cohorts.length === 0 ? (
          <p className="mt-2 text-ink-soft">You do not lead a cohort at the moment.</p>
        ) : (
          <ul className="mt-2 space-y-1">
            {cohorts.map((c) => (
              <li key={c.id}>
                <span className="font-semibold">{c.name}</span>{" "}
                <span className="text-ink-soft">
                  · {c.courseCode} · started {formatDay(c.startsOn)} · <span className="num">{c.memberCount}</span> students
                </span>
              </li>
            ))}
          </ul>
        )}
        {cohortsTotal > cohorts.length && (
          <p className="mt-2 text-caption text-ink-soft" data-testid="lead-count">
            The first <span className="num">{cohorts.length}</span> of <span className="num">{cohortsTotal.toLocaleString("en-GB")}</span>{" "}
            cohorts you lead, by start date.{" "}
            <Link href="/records" className="inline-block min-h-touch py-2 underline">
              Their students in Records
            </Link>
          </p>
        )}
      </section>
    </>
  );
}
