import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { recordStudentsPage } from "@/db/access/records/record-students-page";
import { listCheckInstructors } from "@/db/access/records/stage-checks";
import { recordsListQuerySchema } from "@/lib/records/schema";
import { fieldLabel } from "@/lib/validation/messages";
import { DesignateToggle } from "./_components/designate-toggle";

export const metadata: Metadata = { title: "Records" };
export const dynamic = "force-dynamic";

export default async function RecordsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("checks.record", "/records");
  const raw = Object.fromEntries(Object.entries(await searchParams).filter(([, v]) => typeof v === "string")) as Record<string, string>;
  const parsed = recordsListQuerySchema.safeParse(raw);
  const q = parsed.success ? parsed.data : {};
  const problem = parsed.success ? null : parsed.error.issues[0];
  const {
    rows: students,
    total,
    page,
    pageSize,
    cohorts,
  } = await recordStudentsPage(user, { cohortId: q.cohort, name: q.name }, { page: q.page ?? 1 });
  const byCohort = new Map<string, typeof students>();
  for (const s of students) byCohort.set(s.cohortName ?? "No cohort", [...(byCohort.get(s.cohortName ?? "No cohort") ?? []), s]);
  const instructors = can(user, "stagechecks.designate") ? await listCheckInstructors(user.schoolId) : [];
  const filterEntries = Object.entries(q).filter(([k, v]) => v && k !== "page") as [string, string][];
  const pageHref = (p: number) => `/records?${new URLSearchParams([...filterEntries, ["page", String(p)]]).toString()}`;
  const first = students.length ? (page - 1) * pageSize + 1 : 0;
  const filtered = filterEntries.length > 0;
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-display">Records</h1>
        <p className="text-ink-soft">Choose a student to record an oral check, sign off items or conduct a stage check.</p>
      </header>
      <form method="get" className="card grid gap-3 sm:grid-cols-3" aria-label="Find a student">
        <div>
          <label htmlFor="name" className="field-label">
            Name contains
          </label>
          <input id="name" name="name" type="search" maxLength={100} defaultValue={q.name ?? ""} className="field-input" />
        </div>
        <div>
          <label htmlFor="cohort" className="field-label">
            Cohort
          </label>
          <select id="cohort" name="cohort" defaultValue={q.cohort ?? ""} className="field-input">
            <option value="">Any</option>
            {cohorts.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
        </div>
        <div className="flex items-end gap-2">
          <button type="submit" className="btn-primary">
            Show
          </button>
          {filtered && (
            <Link href="/records" className="btn-quiet">
              Clear
            </Link>
          )}
        </div>
      </form>
      {problem && (
        <p role="alert" className="text-notyet-800">
          {fieldLabel(problem.path)}: {problem.message}. Showing every student instead.
        </p>
      )}
      {students.length === 0 && (
        <p className="text-ink-soft">
          {page > 1 ? `No students on page ${page}.` : filtered ? "No student matches." : "No students to show."}
        </p>
      )}
      {[...byCohort.entries()].map(([cohort, list]) => (
        <section key={cohort} className="card" aria-labelledby={`c-${cohort}`}>
          <h2 id={`c-${cohort}`}>{cohort}</h2>
          <ul className="mt-2 grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
            {list.map((s) => (
              <li key={s.id}>
                <Link href={`/records/${s.id}`} className="btn-quiet w-full justify-start" data-testid="record-student">
                  {s.name}
                </Link>
              </li>
            ))}
          </ul>
        </section>
      ))}
      {(total > pageSize || page > 1) && (
        <nav className="flex flex-wrap items-center gap-3 text-caption" aria-label="Records pages" data-testid="records-pages">
          <span className="text-ink-soft">
            {students.length ? `Students ${first} to ${first + students.length - 1} of ${total}` : `${total} students`}
          </span>
          {page > 1 && (
            <Link className="btn-quiet" href={pageHref(page - 1)} rel="prev">
              Previous page
            </Link>
          )}
          {page * pageSize < total && (
            <Link className="btn-quiet" href={pageHref(page + 1)} rel="next">
              Next page
            </Link>
          )}
        </nav>
      )}
      {instructors.length > 0 && (
        <section className="card" aria-labelledby="check-instructors">
          <h2 id="check-instructors">Check instructors</h2>
          <p className="text-caption text-ink-soft">
            Designated check instructors may conduct stage checks, except for students they lead.
          </p>
          <ul className="mt-2 space-y-2">
            {instructors.map((i) => (
              <li key={i.id} className="flex flex-wrap items-center justify-between gap-2">
                <span>{i.name}</span>
                <DesignateToggle personId={i.id} name={i.name} designated={i.check_instructor} />
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
