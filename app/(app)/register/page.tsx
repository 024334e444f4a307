import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { signOffRegister, registerFilterOptions, WATCH_NOTE_WINDOW } from "@/db/access/records/sign-off-register";
import { chainHead } from "@/db/access/records/audit-chain";
import { registerQuerySchema, toFilter } from "@/lib/records/schema";
import { WideTable } from "@/components/ui/wide-table";
import { SIGN_OFF_STATE_WORDS, STAGE_RESULT_WORDS } from "@/lib/labels";
import { getSchool } from "@/db/access/shared/school";
import { cohortChoices, cohortOption } from "@/db/access/directory/cohorts";
import { instructorChoices, instructorOption } from "@/db/access/directory/instructors";
import { ChoiceField } from "@/components/search-picker";
import { formatDayTime, formatDay } from "@/lib/time";
import { ReviewNote } from "./_components/review-note";

export const metadata: Metadata = { title: "Sign-off register" };
export const dynamic = "force-dynamic";

const STATE_LABEL = { ...SIGN_OFF_STATE_WORDS, ...STAGE_RESULT_WORDS };

export default async function RegisterPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("register.view", "/register");
  const raw = Object.fromEntries(Object.entries(await searchParams).filter(([, v]) => typeof v === "string")) as Record<string, string>;
  const parsed = registerQuerySchema.safeParse(raw);
  const q = parsed.success ? parsed.data : {};
  const [{ rows, notes, total, page, pageSize }, options, head, cohorts, cohort, instructors, instructor] = await Promise.all([
    signOffRegister(user, toFilter(q), { page: q.page ?? 1 }),
    registerFilterOptions(user.schoolId),
    chainHead(user.schoolId),
    // the cohort filter lists while few, else searches (GET /api/directory/cohorts?purpose=register)
    cohortChoices(user, "register"),
    cohortOption(user, "register", q.cohort),
    // likewise the signers and examiners (GET /api/directory/instructors?purpose=register)
    instructorChoices(user, "register"),
    instructorOption(user, "register", q.instructor),
  ]);
  const school = await getSchool(user.schoolId);
  const mayReview = can(user, "register.review");
  const filterEntries = Object.entries(q).filter(([k, v]) => v && k !== "page") as [string, string][];
  const qs = new URLSearchParams(filterEntries).toString();
  const pageHref = (p: number) => `/register?${new URLSearchParams([...filterEntries, ["page", String(p)]]).toString()}`;
  const first = rows.length ? (page - 1) * (pageSize ?? 0) + 1 : 0;
  const hasNext = pageSize !== null && page * pageSize < total;
  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-display">Sign-off register</h1>
          <p className="text-caption text-ink-soft num break-all">
            Audit chain head {head.hash} · {head.position} events
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          <a className="btn-quiet" href={`/api/register/export${qs ? `?${qs}` : ""}`} data-testid="export-csv" download>
            Export CSV
          </a>
          {can(user, "audit.verify") && (
            <Link className="btn-quiet" href="/register/chain">
              Verify the audit chain
            </Link>
          )}
        </div>
      </header>
      {!parsed.success && (
        <p role="alert" className="field-error" data-testid="filter-error">
          Filters not applied: {parsed.error.issues[0]?.path.join(".")} {parsed.error.issues[0]?.message}
        </p>
      )}
      <form method="get" className="card grid gap-3 sm:grid-cols-2 lg:grid-cols-5" aria-label="Filters">
        <ChoiceField
          id="instructor"
          name="instructor"
          label="Signer or examiner"
          emptyLabel="Anyone"
          placeholder="Anyone: type a name"
          choices={instructors}
          defaultValue={q.instructor ?? ""}
          initial={instructor}
          endpoint="/api/directory/instructors"
          params={{ purpose: "register" }}
        />
        <ChoiceField
          id="cohort"
          name="cohort"
          label="Cohort"
          emptyLabel="Any"
          placeholder="Any: type a cohort's name"
          choices={cohorts}
          defaultValue={q.cohort ?? ""}
          initial={cohort}
          endpoint="/api/directory/cohorts"
          params={{ purpose: "register" }}
        />
        <div>
          <label htmlFor="stage" className="field-label">
            Stage
          </label>
          <select id="stage" name="stage" defaultValue={q.stage ?? ""} className="field-input">
            <option value="">Any</option>
            {options.stages.map((s) => (
              <option key={s.id} value={s.id}>
                {s.label}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="from" className="field-label">
            From
          </label>
          <input id="from" name="from" type="date" defaultValue={q.from ?? ""} className="field-input" />
        </div>
        <div>
          <label htmlFor="to" className="field-label">
            To
          </label>
          <input id="to" name="to" type="date" defaultValue={q.to ?? ""} className="field-input" />
        </div>
        <div className="flex gap-2 sm:col-span-2 lg:col-span-5">
          <button type="submit" className="btn-primary">
            Apply filters
          </button>
          <Link href="/register" className="btn-quiet">
            Clear
          </Link>
        </div>
      </form>

      <section className="card" aria-labelledby="notes-title">
        <h2 id="notes-title">
          Watch notes <span className="text-caption font-normal text-ink-soft">({notes.length})</span>
        </h2>
        <p className="text-caption text-ink-soft">
          Raised by the latest {WATCH_NOTE_WINDOW} sign-offs, stage checks and oral checks; each row below shows its own.
        </p>
        {notes.length === 0 ? (
          <p className="text-ink-soft">No watch notes.</p>
        ) : (
          <ul className="mt-2 space-y-1" data-testid="watch-notes">
            {notes.map((n, i) => (
              <li key={`${n.recordId}-${n.kind}-${i}`} data-testid="watch-note" data-reviewed={n.reviews?.length ? "yes" : "no"}>
                <span className="mr-2 rounded bg-unstable-100 px-1.5 text-caption font-semibold text-unstable-700">{n.label}</span>
                <Link className="underline" href={`/records/${n.studentId}`}>
                  {n.studentName}
                </Link>
                {n.itemCode ? ` · ${n.itemCode}` : ""} · {n.detail}
                {(n.reviews ?? []).map((r, k) => (
                  <p key={k} className="ml-4 text-caption" data-testid="watch-note-review">
                    <span className="font-semibold">Reviewed</span> by {r.reviewerName} on {formatDayTime(r.reviewedAt, school.timeZone)}:{" "}
                    {r.remark}
                  </p>
                ))}
                {mayReview && (
                  <ReviewNote
                    note={{ recordType: n.recordType, recordId: n.recordId, kind: n.kind, itemCode: n.itemCode, label: n.label }}
                  />
                )}
              </li>
            ))}
          </ul>
        )}
      </section>

      <section className="card" aria-labelledby="rows-title">
        <h2 id="rows-title">
          Sign-offs and stage checks <span className="text-caption font-normal text-ink-soft">({total})</span>
        </h2>
        <div className="mt-2">
          <WideTable label="Sign-offs and stage checks, scrolls sideways" more={4}>
            <table className="data-table text-caption" data-testid="register-table">
              <thead>
                <tr>
                  <th scope="col">Date</th>
                  <th scope="col">Student</th>
                  <th scope="col">Item or stage</th>
                  <th scope="col" data-more="">
                    Signer / examiner
                  </th>
                  <th scope="col" data-more="">
                    Basis
                  </th>
                  <th scope="col" data-more="">
                    State
                  </th>
                  <th scope="col" data-more="">
                    Watch notes
                  </th>
                </tr>
              </thead>
              <tbody>
                {rows.map((r) => (
                  <tr key={r.id} data-testid="register-row">
                    <td className="num whitespace-nowrap">{formatDay(r.date)}</td>
                    <td>
                      <Link className="underline" href={`/records/${r.studentId}`}>
                        {r.studentName}
                      </Link>
                      <br />
                      <span className="text-ink-soft">{r.cohortName ?? ""}</span>
                    </td>
                    <td>
                      {r.itemCode ? (
                        <>
                          <span className="num font-semibold">{r.itemCode}</span> {r.itemTitle}
                        </>
                      ) : (
                        r.itemTitle
                      )}
                    </td>
                    <td data-more="">{r.signerName}</td>
                    <td data-more="">{r.basis}</td>
                    <td data-more="">
                      {STATE_LABEL[r.state]}
                      {r.reason ? `: ${r.reason}` : ""}
                    </td>
                    <td data-more="">{r.notes.map((n) => n.label).join(", ") || "—"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </WideTable>
        </div>
        <nav className="mt-3 flex flex-wrap items-center gap-3 text-caption" aria-label="Register pages" data-testid="register-pages">
          <span className="text-ink-soft">
            {rows.length ? `Rows ${first} to ${first + rows.length - 1} of ${total}` : `No rows on page ${page}`}
          </span>
          {page > 1 && (
            <Link className="btn-quiet" href={pageHref(page - 1)} rel="prev">
              Previous page
            </Link>
          )}
          {hasNext && (
            <Link className="btn-quiet" href={pageHref(page + 1)} rel="next">
              Next page
            </Link>
          )}
        </nav>
      </section>
    </div>
  );
}
