import { getActiveEnrolment } from "@/db/access/cohorts/student-enrolment";
import type { CurrentUser } from "@/lib/auth/session";
import { hoursLabel } from "@/lib/time";
import { creditedMinutesFor } from "@/db/access/ground-log/ground-hours";
import { AssignmentsThisWeek } from "./assignments-this-week";

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
  const credited = await creditedMinutesFor(user.id, enrolment.courseId);
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
    </section>
  );
}
