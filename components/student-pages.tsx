import Link from "next/link";
import type { ReactNode } from "react";
import { COHORT_CHOICES_MAX } from "@/lib/records/schema";
import { fieldLabel } from "@/lib/validation/messages";

// The UI pieces of a paged student list (Records, Progress map, Ground log): the filter form
// (a part of the name, a cohort: chosen from a list, or a part of its name when the school has
// more than COHORT_CHOICES_MAX), the line that names a bad query string, and the page links
// (Previous / Next keep the filters, "Students x to y of N"). The lists themselves stay each page's own.

export interface StudentListState {
  cohort?: string | undefined;
  cohortName?: string | undefined;
  name?: string | undefined;
  page?: number | undefined;
}

/** The filters that are set, as query-string pairs (the page left out). */
function filterPairs(q: StudentListState, keep: [string, string][] = []): [string, string][] {
  const pairs: [string, string][] = [...keep];
  if (q.name) pairs.push(["name", q.name]);
  if (q.cohort) pairs.push(["cohort", q.cohort]);
  if (q.cohortName) pairs.push(["cohortName", q.cohortName]);
  return pairs;
}

/** The address of page `page` of the list at `basePath`, keeping its filters (and `keep`, e.g. the chosen student). */
export function studentPageHref(basePath: string, q: StudentListState, page: number, keep: [string, string][] = []): string {
  const pairs = filterPairs(q, keep);
  if (page > 1) pairs.push(["page", String(page)]);
  return pairs.length ? `${basePath}?${new URLSearchParams(pairs).toString()}` : basePath;
}

export function isFiltered(q: StudentListState): boolean {
  return Boolean(q.name || q.cohort || q.cohortName);
}

export function StudentFilterForm({
  basePath,
  q,
  cohorts,
  idPrefix = "sl",
  keep = [],
  label = "Find a student",
  submitLabel = "Show",
  bare = false,
}: {
  basePath: string;
  q: StudentListState;
  cohorts: { id: string; name: string }[];
  idPrefix?: string;
  /** other query-string pairs the form carries on (hidden) */
  keep?: [string, string][];
  label?: string;
  submitLabel?: string;
  /** inside a card already: no card of its own */
  bare?: boolean;
}) {
  return (
    <form method="get" action={basePath} className={`${bare ? "" : "card "}grid gap-3 sm:grid-cols-3`} aria-label={label}>
      {keep.map(([k, v]) => (
        <input key={k} type="hidden" name={k} value={v} />
      ))}
      <div>
        <label htmlFor={`${idPrefix}-name`} className="field-label">
          Name contains
        </label>
        <input id={`${idPrefix}-name`} name="name" type="search" maxLength={100} defaultValue={q.name ?? ""} className="field-input" />
      </div>
      {cohorts.length > COHORT_CHOICES_MAX ? (
        // too many cohorts to offer as choices: a part of the cohort's name instead
        <div>
          <label htmlFor={`${idPrefix}-cohort-name`} className="field-label">
            Cohort name contains
          </label>
          <input
            id={`${idPrefix}-cohort-name`}
            name="cohortName"
            type="search"
            maxLength={100}
            defaultValue={q.cohortName ?? ""}
            className="field-input"
          />
        </div>
      ) : (
        <div>
          <label htmlFor={`${idPrefix}-cohort`} className="field-label">
            Cohort
          </label>
          <select id={`${idPrefix}-cohort`} name="cohort" defaultValue={q.cohort ?? ""} className="field-input">
            <option value="">Any</option>
            {cohorts.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
        </div>
      )}
      <div className="flex items-end gap-2">
        <button type="submit" className="btn-primary">
          {submitLabel}
        </button>
        {isFiltered(q) && (
          <Link href={studentPageHref(basePath, {}, 1, keep)} className="btn-quiet">
            Clear
          </Link>
        )}
      </div>
    </form>
  );
}

/** What to say when a page of the list holds no student. */
export function noStudentsWords(q: StudentListState, page: number, none: ReactNode = "No students to show."): ReactNode {
  return page > 1 ? `No students on page ${page}.` : isFiltered(q) ? "No student matches." : none;
}

/** Previous / Next page links of any paged list, keeping its query-string pairs, and "<noun> x to y of N". */
export function ListPageNav({
  basePath,
  pairs,
  page,
  pageSize,
  shown,
  total,
  label,
  testId,
  noun = "Students",
}: {
  basePath: string;
  /** the list's filters (and anything else to keep), as query-string pairs, the page left out */
  pairs: [string, string][];
  page: number;
  pageSize: number;
  /** how many rows this page shows */
  shown: number;
  total: number;
  label: string;
  testId: string;
  noun?: string;
}) {
  if (total <= pageSize && page <= 1) return null;
  const first = (page - 1) * pageSize + 1;
  const n = (x: number) => x.toLocaleString("en-GB");
  const href = (p: number) => {
    const all: [string, string][] = p > 1 ? [...pairs, ["page", String(p)]] : pairs;
    return all.length ? `${basePath}?${new URLSearchParams(all).toString()}` : basePath;
  };
  return (
    <nav className="flex flex-wrap items-center gap-3 text-caption" aria-label={label} data-testid={testId}>
      <span className="num text-ink-soft">
        {shown ? `${noun} ${n(first)} to ${n(first + shown - 1)} of ${n(total)}` : `${n(total)} in all`}
      </span>
      {page > 1 && (
        <Link className="btn-quiet" href={href(page - 1)} rel="prev">
          Previous page
        </Link>
      )}
      {page * pageSize < total && (
        <Link className="btn-quiet" href={href(page + 1)} rel="next">
          Next page
        </Link>
      )}
    </nav>
  );
}

export function StudentPageNav({
  basePath,
  q,
  keep = [],
  ...rest
}: {
  basePath: string;
  q: StudentListState;
  page: number;
  pageSize: number;
  /** how many students this page shows */
  shown: number;
  total: number;
  label: string;
  testId: string;
  keep?: [string, string][];
}) {
  return <ListPageNav basePath={basePath} pairs={filterPairs(q, keep)} {...rest} />;
}

/** The filter of a list narrowed by a part of a name only (the Cohorts page, Accounts and roles, the endorsement log, transfer credits). */
export function NameFilterForm({
  basePath,
  name,
  idPrefix,
  label,
  submitLabel = "Show",
  fieldLabel = "Name contains",
}: {
  basePath: string;
  name: string | undefined;
  idPrefix: string;
  label: string;
  submitLabel?: string;
  /** the field's label, e.g. "Student's name contains" on a list of records about students */
  fieldLabel?: string;
}) {
  return (
    <form method="get" action={basePath} className="card flex flex-wrap items-end gap-3" aria-label={label}>
      {/* named on screen too: on its own between other cards, "Name contains" alone did not say what it narrows */}
      <h2 className="w-full">{label}</h2>
      <div>
        <label htmlFor={`${idPrefix}-name`} className="field-label">
          {fieldLabel}
        </label>
        <input id={`${idPrefix}-name`} name="name" type="search" maxLength={100} defaultValue={name ?? ""} className="field-input" />
      </div>
      <button type="submit" className="btn-primary">
        {submitLabel}
      </button>
      {name && (
        <Link href={basePath} className="btn-quiet">
          Clear
        </Link>
      )}
    </form>
  );
}

/**
 * A list's query string that did not parse: the field and what is wrong with it, and what the page
 * shows instead (e.g. "every student"), announced to screen readers.
 */
export function QueryProblem({
  problem,
  instead,
  className = "",
}: {
  problem: { path: PropertyKey[]; message: string } | null;
  instead: string;
  className?: string;
}) {
  if (!problem) return null;
  return (
    <p role="alert" className={`${className} text-notyet-800`.trim()}>
      {fieldLabel(problem.path)}: {problem.message}. Showing {instead} instead.
    </p>
  );
}
