import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/guard";
import { transferCreditsPage } from "@/db/access/transfers/credits";
import { transferChoices } from "@/db/access/transfers/students";
import { getSchool } from "@/db/access/shared/school";
import { formatDay, hoursLabel } from "@/lib/time";
import { parseNameListQuery } from "@/lib/records/student-list-query";
import { ListPageNav, NameFilterForm, QueryProblem } from "@/components/student-pages";
import { TransferForm } from "./_components/transfer-form";

export const metadata: Metadata = { title: "Transfers in" };
export const dynamic = "force-dynamic";

const TEST_WORDS = { knowledge: "Knowledge test", proficiency: "Proficiency test", both: "Knowledge and proficiency tests" } as const;

export default async function TransfersPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("transfers.manage", "/transfers");
  const { student: chosen, ...listParams } = await searchParams;
  // the credits recorded a page at a time (?name=, ?page=); they are kept for years
  const { q, problem } = parseNameListQuery(listParams);
  // every student in training while few; above PICKER_LIST_MAX, the student chosen in the search picker (?student=)
  const [{ rows: credits, total, page, pageSize }, choices, school] = await Promise.all([
    transferCreditsPage(user, { name: q.name }, { page: q.page ?? 1 }),
    transferChoices(user, { studentId: typeof chosen === "string" ? chosen : undefined }),
    getSchool(user.schoolId),
  ]);
  const students = choices.students.map((s) => ({
    ...s,
    items: (choices.items[s.revisionId] ?? []).map((i) => ({ id: i.id, code: i.code, title: i.title, stageCode: i.stageCode })),
  }));
  return (
    <div className="max-w-3xl space-y-6">
      <div>
        <h1 className="text-display">Transfers in</h1>
        <p className="text-ink-soft">
          Credit for ground training a student had at an earlier school, on the strength of a test this school gave. Credited time counts in
          the student&apos;s ground hours, and credited items show on the Progress map and the training record. A credit cannot be changed
          once recorded.
        </p>
      </div>
      <section aria-labelledby="record-credit" className="space-y-2">
        <h2 id="record-credit">Record a credit</h2>
        <TransferForm
          key={choices.kind === "search" ? (students[0]?.id ?? "none") : "list"}
          students={students}
          search={choices.kind === "search"}
        />
      </section>
      <section aria-labelledby="credits" className="space-y-2">
        <h2 id="credits">
          Credits recorded{" "}
          <span className="num text-ink-soft">
            ({total.toLocaleString("en-GB")}
            {q.name ? " matching" : ""})
          </span>
        </h2>
        <NameFilterForm
          basePath="/transfers"
          name={q.name}
          idPrefix="credits"
          label="Find a student's credits"
          fieldLabel="Student's name contains"
        />
        <QueryProblem problem={problem} instead="every credit" />
        <ListPageNav
          basePath="/transfers"
          pairs={[
            ...(q.name ? ([["name", q.name]] as [string, string][]) : []),
            ...(typeof chosen === "string" ? ([["student", chosen]] as [string, string][]) : []),
          ]}
          page={page}
          pageSize={pageSize}
          shown={credits.length}
          total={total}
          label="Credits recorded pages"
          testId="transfer-credits-pages"
          noun="Credits"
        />
        {credits.length === 0 ? (
          <p className="text-ink-soft">
            {page > 1
              ? `No credits on page ${page}.`
              : q.name
                ? "No credit for a student by that name."
                : "No transfer credit has been recorded."}
          </p>
        ) : (
          <ul className="space-y-2">
            {credits.map((c) => (
              <li key={c.id} className="card space-y-1" data-testid="transfer-credit">
                <p className="font-semibold">
                  {c.studentName} · from {c.sourceSchool}
                </p>
                <p>
                  {hoursLabel(c.creditedMinutes)} credited (<span className="num">{c.creditedMinutes}</span> min; cap{" "}
                  <span className="num">{c.capMinutes}</span> min, {c.sourceApproved ? "approved course, 50%" : "course not approved, 25%"})
                </p>
                <p>Items: {c.items.length === 0 ? "none" : c.items.map((i) => i.code).join(", ")}</p>
                <p>
                  {TEST_WORDS[c.testKind]} on {formatDay(c.testTakenOn)}: {c.testResult}
                </p>
                {c.note && <p className="text-ink-soft">{c.note}</p>}
                <p className="text-caption text-ink-soft break-words">
                  Evidence:{" "}
                  <a href={`/api/transfers/credits/${c.id}/evidence`} download>
                    {c.evidenceFileName}
                  </a>{" "}
                  · recorded by {c.recordedByName} on {formatDay(c.createdAt, school.timeZone)}
                </p>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
