import { getActiveEnrolment } from "@/db/access/cohorts/student-enrolment";
import type { CurrentUser } from "@/lib/auth/session";
import { hoursLabel } from "@/lib/time";
import { creditedMinutesFor } from "@/db/access/ground-log/ground-hours";
import { AssignmentsThisWeek } from "./assignments-this-week";
import { studentWeekFor } from "@/db/access/today/student-week";
import { MAKEUP_STATE_WORDS } from "@/lib/labels";
import Link from "next/link";

export async function StudentToday({ user }: { user: CurrentUser }) {
  const enrolment = await getActiveEnrolment(user.id);
  if (!enrolment) {
    return (
      <section className="card">
        <h2>This week</h2>
        <p className="mt-2 text-ink-soft">You are not enrolled on a course at the moment.</p>
      </section>
    );
  }
  const week = await studentWeekFor(user);
  // the week has summed the credited minutes already (the same course); read them only without it
  const credited = week ? week.creditedMinutes : await creditedMinutesFor(user.id, enrolment.courseId);
  const pct = Math.min(100, Math.round((credited / Math.max(1, enrolment.minGroundMinutes)) * 100));
  return (
    <section className="card" aria-labelledby="week-title">
      <h2 id="week-title">This week</h2>
      <p className="mt-1 text-ink-soft">
        {enrolment.courseTitle} · syllabus revision {enrolment.revisionNumber}
        {enrolment.cohortName && (
          <>
            {" "}
            · {enrolment.cohortName}, lead instructor {enrolment.leadInstructorName}
          </>
        )}
      </p>
      {week && (
        <p
          className={`mt-3 font-semibold ${week.assessment.standing === "behind" ? "text-notyet-800" : "text-solid-800"}`}
          data-testid="on-track"
          data-standing={week.assessment.standing}
        >
          {week.assessment.line}
        </p>
      )}
      {week && week.next.length > 0 && (
        <div className="mt-4" data-testid="next-steps">
          <h3 className="text-caption font-semibold text-ink-soft">What to do next</h3>
          <ul className="mt-1 space-y-1">
            {week.next.map((n, i) => (
              <li key={i} data-kind={n.kind}>
                <Link href={n.href} className="inline-flex min-h-touch items-center font-medium">
                  {n.text}
                </Link>
              </li>
            ))}
          </ul>
        </div>
      )}
      <div className="mt-4">
        <p className="text-caption font-semibold text-ink-soft">Ground hours</p>
        <p className="num text-title" data-testid="ground-hours">
          {hoursLabel(credited, enrolment.minGroundMinutes)}
        </p>
        <div className="mt-1 h-3 w-full overflow-hidden rounded bg-paper-deep" role="img" aria-label={`${pct}% of the course minimum`}>
          <div className="h-full bg-wing-500" style={{ width: `${pct}%` }} />
        </div>
      </div>
      <AssignmentsThisWeek user={user} />
      {week && (
        <div className="mt-4" data-testid="today-makeups">
          <h3 className="text-caption font-semibold text-ink-soft">Open make-ups</h3>
          {week.makeups.length === 0 ? (
            <p className="text-ink-soft">None: nothing missed.</p>
          ) : (
            <ul className="mt-1 space-y-1">
              {week.makeups.map((m) => (
                <li key={m.id} className="flex flex-wrap items-baseline gap-x-2">
                  <span className="font-medium">
                    {m.itemCode} {m.itemTitle}
                  </span>
                  <span className="text-caption text-ink-soft">
                    {MAKEUP_STATE_WORDS[m.state]}
                    {m.missed ? ` · missed at ${m.missed}` : ""}
                  </span>
                </li>
              ))}
            </ul>
          )}
          <Link href="/ground-log#makeup-title" className="mt-1 inline-flex min-h-touch items-center text-caption">
            Make-ups on your Ground log
          </Link>
        </div>
      )}
    </section>
  );
}
