import { listCohorts } from "@/db/access/cohorts/list-cohorts";
import type { CurrentUser } from "@/lib/auth/session";

export async function InstructorToday({ user }: { user: CurrentUser }) {
  const cohorts = await listCohorts(user.schoolId, { leadInstructorId: user.id });
  return (
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
                · {c.courseCode} · started {c.startsOn} · <span className="num">{c.memberCount}</span> students
              </span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
