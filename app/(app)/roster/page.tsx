import type { Metadata } from "next";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { rosterPage, type RosterRow } from "@/db/access/roster/roster-page";
import { cohortChoices } from "@/db/access/directory/cohorts";
import { choicesFrom } from "@/lib/directory/picker";
import { cohortsManagedBy } from "@/db/access/roster/managed-cohorts";
import { getSchool } from "@/db/access/shared/school";
import { parseStudentListQuery } from "@/lib/records/student-list-query";
import { dateInZone, formatDay } from "@/lib/time";
import { now } from "@/lib/clock";
import { StudentFilterForm, StudentPageNav, noStudentsWords, QueryProblem } from "@/components/student-pages";
import { AddStudentForm } from "./_components/add-student-form";
import { RosterImport } from "./_components/roster-import";
import { MoveStudent } from "./_components/move-student";
import { WideTable } from "@/components/ui/wide-table";

export const metadata: Metadata = { title: "Roster" };
export const dynamic = "force-dynamic";

export default async function RosterPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("roster.manage", "/roster");
  const { q, problem, filter } = parseStudentListQuery(await searchParams);
  const school = await getSchool(user.schoolId);
  const everyCohort = can(user, "roster.all");
  // the forms' cohort choices: every open cohort to move to, the cohorts the caller leads (every one with
  // roster.all) to add to; listed while few, else searched (GET /api/directory/cohorts, purpose roster)
  const [{ rows, total, page, pageSize, cohorts }, moveTo, addTo] = await Promise.all([
    rosterPage(user, filter, { page: q.page ?? 1 }),
    cohortChoices(user, "roster"),
    everyCohort ? null : cohortsManagedBy(user),
  ]);
  // the page's rows come ordered by cohort: one section for each cohort on this page
  const byCohort: RosterRow[][] = [];
  for (const r of rows) {
    const last = byCohort.at(-1);
    if (last && last[0]!.cohortId === r.cohortId) last.push(r);
    else byCohort.push([r]);
  }
  const today = dateInZone(now(), school.timeZone);
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-display">Roster</h1>
        <p className="text-ink-soft">
          {everyCohort ? "The school's students by cohort, 50 a page." : "The students of the cohorts you lead, 50 a page."} Students keep
          their whole cohort history when they move.
        </p>
      </header>
      <StudentFilterForm basePath="/roster" q={q} cohorts={cohorts} idPrefix="roster" />
      <QueryProblem problem={problem} instead="every student" />
      {rows.length === 0 && <p className="text-ink-soft">{noStudentsWords(q, page, "No students in your cohorts now.")}</p>}
      {byCohort.map((members) => {
        const c = members[0]!;
        return (
          <section key={c.cohortId} className="card" aria-labelledby={`c-${c.cohortId}`}>
            <h2 id={`c-${c.cohortId}`}>
              {c.cohortName}{" "}
              <span className="text-caption font-normal text-ink-soft">
                · {c.courseCode} · lead instructor {c.leadInstructorName} · from {formatDay(c.startsOn)} ·{" "}
                <span className="num">{c.cohortSize}</span> students
              </span>
            </h2>
            <div className="mt-2">
              <WideTable label={`${c.cohortName} students, scrolls sideways`} more={3}>
                <table className="data-table" data-testid="roster-table">
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
                            currentCohortId={c.cohortId}
                            choices={moveTo}
                            today={today}
                          />
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </WideTable>
            </div>
          </section>
        );
      })}
      <StudentPageNav
        basePath="/roster"
        q={q}
        page={page}
        pageSize={pageSize}
        shown={rows.length}
        total={total}
        label="Roster pages"
        testId="roster-pages"
      />
      <div className="grid gap-6 lg:grid-cols-2">
        <AddStudentForm choices={addTo ? choicesFrom(addTo.map((c) => ({ id: c.id, name: c.name }))) : moveTo} />
        <RosterImport />
      </div>
    </div>
  );
}
