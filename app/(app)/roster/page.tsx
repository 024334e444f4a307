import type { Metadata } from "next";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { listCohorts } from "@/db/access/cohorts/list-cohorts";
import { listRoster } from "@/db/access/roster/list-roster";
import { cohortsManagedBy } from "@/db/access/roster/managed-cohorts";
import { getSchool } from "@/db/access/shared/school";
import { dateInZone, formatDay } from "@/lib/time";
import { now } from "@/lib/clock";
import { AddStudentForm } from "./_components/add-student-form";
import { RosterImport } from "./_components/roster-import";
import { MoveStudent } from "./_components/move-student";
import { WideTable } from "@/components/ui/wide-table";

export const metadata: Metadata = { title: "Roster" };
export const dynamic = "force-dynamic";

export default async function RosterPage() {
  const user = await requirePagePermission("roster.manage", "/roster");
  const school = await getSchool(user.schoolId);
  const everyCohort = can(user, "roster.all");
  const cohorts = await listCohorts(user.schoolId, everyCohort ? {} : { leadInstructorId: user.id });
  const managed = await cohortsManagedBy(user);
  const allCohorts = (await listCohorts(user.schoolId)).map((c) => ({ id: c.id, name: c.name }));
  const students = await listRoster(user);
  const today = dateInZone(now(), school.timeZone);
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-display">Roster</h1>
        <p className="text-ink-soft">
          {everyCohort ? "Every cohort of the school." : "The cohorts you lead."} Students keep their whole cohort history when they move.
        </p>
      </header>
      {cohorts.map((c) => {
        const members = students.filter((s) => s.cohortId === c.id);
        return (
          <section key={c.id} className="card" aria-labelledby={`c-${c.id}`}>
            <h2 id={`c-${c.id}`}>
              {c.name}{" "}
              <span className="text-caption font-normal text-ink-soft">
                · {c.courseCode} · lead instructor {c.leadInstructorName} · from {formatDay(c.startsOn)} ·{" "}
                <span className="num">{members.length}</span> students
              </span>
            </h2>
            <div className="mt-2">
              <WideTable label={`${c.name} students, scrolls sideways`} more={3}>
                <table className="data-table">
                  <thead>
                    <tr>
                      <th scope="col">Student</th>
                      <th scope="col" data-more="">
                        E-mail
                      </th>
                      <th scope="col">Cohort history</th>
                      <th scope="col" data-more="">
                        Sponsor
                      </th>
                      <th scope="col" data-more="">
                        Move
                      </th>
                    </tr>
                  </thead>
                  <tbody>
                    {members.map((m) => (
                      <tr key={m.studentId}>
                        <td>{m.name}</td>
                        <td className="whitespace-nowrap" data-more="">
                          {m.email}
                        </td>
                        <td className="text-caption">
                          {m.history.map((h) => (
                            <span key={`${h.cohortName}-${h.fromDate}`} className="block num">
                              {h.cohortName}: {formatDay(h.fromDate)} – {h.toDate ? formatDay(h.toDate) : "now"}
                            </span>
                          ))}
                        </td>
                        <td data-more="">{m.sponsors.length ? m.sponsors.join(", ") : "—"}</td>
                        <td data-more="">
                          <MoveStudent
                            studentId={m.studentId}
                            studentName={m.name}
                            currentCohortId={c.id}
                            cohorts={allCohorts}
                            today={today}
                          />
                        </td>
                      </tr>
                    ))}
                    {members.length === 0 && (
                      <tr>
                        <td colSpan={5} className="text-ink-soft">
                          No students in this cohort now.
                        </td>
                      </tr>
                    )}
                  </tbody>
                </table>
              </WideTable>
            </div>
          </section>
        );
      })}
      <div className="grid gap-6 lg:grid-cols-2">
        <AddStudentForm cohorts={managed.map((c) => ({ id: c.id, name: c.name }))} />
        <RosterImport />
      </div>
    </div>
  );
}
