import type { Metadata } from "next";
import Link from "next/link";
import { can, requirePagePermission } from "@/lib/auth/guard";
import { endorsableStudents, endorsementChoices, endorsementLogPage } from "@/db/access/endorsements/log";
import { parseNameListQuery } from "@/lib/records/student-list-query";
import { ListPageNav, NameFilterForm, QueryProblem } from "@/components/student-pages";
import { formatDay } from "@/lib/time";
import { ScrollArea } from "@/components/ui/scroll-area";
import { EndorsementForms } from "./_components/endorsement-forms";

export const metadata: Metadata = { title: "Endorsements" };
export const dynamic = "force-dynamic";

export default async function EndorsementsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("endorsements.view", "/endorsements");
  const { q, problem } = parseNameListQuery(await searchParams);
  // the log a page at a time (it is never pruned); the result form's choices from their own query
  const [{ rows: log, total, page, pageSize }, awaiting, students, remedials] = await Promise.all([
    endorsementLogPage(user, { name: q.name }, { page: q.page ?? 1 }),
    endorsementChoices(user, "awaiting"),
    endorsableStudents(user),
    endorsementChoices(user, "remedial"),
  ]);
  return (
    <div className="max-w-5xl space-y-6">
      <div>
        <h1 className="text-display">Knowledge-test endorsements</h1>
        <p className="text-ink-soft">
          {can(user, "endorsements.all") ? "Every endorsement of the school" : "The endorsements you signed"}, with the result once known.
          Records are kept and never deleted (at least 3 years, 14 CFR 61.189).{" "}
          {can(user, "reports.view") && <Link href="/endorsements/pass-rate">First-attempt pass rate</Link>}
          {can(user, "endorsements.settings") && (
            <>
              {" · "}
              <Link href="/endorsements/settings">Endorsement settings</Link>
            </>
          )}
        </p>
      </div>
      <EndorsementForms
        students={students}
        awaiting={awaiting}
        remedials={remedials}
        maySign={can(user, "endorsements.sign")}
        mayRecord={can(user, "endorsements.results")}
      />
      <section aria-labelledby="endorsement-log-heading" className="space-y-3">
        <h2 id="endorsement-log-heading">Endorsement log</h2>
        <NameFilterForm
          basePath="/endorsements"
          name={q.name}
          idPrefix="endorsements"
          label="Find a student's endorsements"
          fieldLabel="Student's name contains"
        />
        <QueryProblem problem={problem} instead="the whole log" />
        <ListPageNav
          basePath="/endorsements"
          pairs={q.name ? [["name", q.name]] : []}
          page={page}
          pageSize={pageSize}
          shown={log.length}
          total={total}
          label="Endorsement log pages"
          testId="endorsement-log-pages"
          noun="Endorsements"
        />
        {log.length === 0 ? (
          <p className="text-ink-soft" data-testid="endorsement-log-empty">
            {page > 1 ? `No endorsements on page ${page}.` : q.name ? "No endorsement of a student by that name." : "No endorsements yet."}
          </p>
        ) : (
          <ScrollArea label="Endorsement log">
            <table className="data-table" data-testid="endorsement-log">
              <thead>
                <tr>
                  <th scope="col">Student</th>
                  <th scope="col">Test</th>
                  <th scope="col">Endorsed</th>
                  <th scope="col">Instructor</th>
                  <th scope="col">Attempt</th>
                  <th scope="col">Result</th>
                  <th scope="col">Areas missed</th>
                </tr>
              </thead>
              <tbody>
                {log.map((r) => (
                  <tr key={r.id}>
                    <td>{r.studentName}</td>
                    <td>
                      {r.authorityName} knowledge test, {r.courseCode}
                    </td>
                    <td>{formatDay(r.endorsedOn)}</td>
                    <td>{r.instructorName}</td>
                    <td className="num">{r.attempt}</td>
                    <td>
                      {r.takenOn === null
                        ? "Awaiting result"
                        : `${r.scorePercent} % on ${formatDay(r.takenOn)}: ${r.passed ? `passed (counts until ${formatDay(r.validUntil!)})` : "not passed"}`}
                    </td>
                    <td>{r.areasMissed.join(", ") || "None"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollArea>
        )}
      </section>
    </div>
  );
}
