import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { listBriefings } from "@/db/access/briefings/list";
import { briefingListQuery } from "@/lib/briefings/schema";
import { getSchool } from "@/db/access/shared/school";
import { formatDay } from "@/lib/time";
import { WideTable } from "@/components/ui/wide-table";

export const metadata: Metadata = { title: "Briefings" };
export const dynamic = "force-dynamic";

type Search = Record<string, string | string[] | undefined>;
const COLUMNS = [
  { key: "title", label: "Briefing" },
  { key: "minutes", label: "Minutes" },
  { key: "revision", label: "Revision" },
  { key: "updated", label: "Last revised" },
] as const;

export default async function BriefingsPage({ searchParams }: { searchParams: Promise<Search> }) {
  const user = await requirePagePermission("briefings.view", "/briefings");
  const raw = Object.fromEntries(
    Object.entries(await searchParams)
      .map(([k, v]) => [k, Array.isArray(v) ? v[0] : v])
      .filter(([, v]) => v !== undefined && v !== ""),
  );
  const parsed = briefingListQuery.safeParse(raw);
  const query = parsed.success ? parsed.data : briefingListQuery.parse({});
  const badField = parsed.success ? null : parsed.error.issues[0];
  const [result, school] = await Promise.all([listBriefings(user, query), getSchool(user.schoolId)]);
  const pages = Math.max(1, Math.ceil(result.total / query.pageSize));
  const href = (over: Record<string, string | number | undefined>) => {
    const p = new URLSearchParams();
    const merged = {
      q: query.q,
      item: query.item,
      sort: query.sort,
      dir: query.dir,
      page: query.page,
      pageSize: query.pageSize === 20 ? undefined : query.pageSize,
      ...over,
    };
    for (const [k, v] of Object.entries(merged)) if (v !== undefined && v !== "") p.set(k, String(v));
    return `/briefings?${p.toString()}`;
  };
  const isStudent = !can(user, "briefings.edit");
  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-display">Briefings</h1>
          <p className="text-ink-soft">
            {isStudent
              ? "Briefings scheduled for you or assigned to you."
              : "Lesson plans for ground sessions. Each change is kept as a numbered revision."}
          </p>
        </div>
        {can(user, "briefings.edit") && (
          <Link href="/briefings/new" className="btn-primary">
            New briefing
          </Link>
        )}
      </header>
      {badField && (
        <p role="alert" className="field-error">
          The filter was not applied: {badField.path.join(".")}: {badField.message}.
        </p>
      )}
      <form method="get" className="card flex flex-wrap items-end gap-3" aria-label="Filter briefings">
        <div className="min-w-48 flex-1">
          <label htmlFor="q" className="field-label">
            Title or objective contains
          </label>
          <input id="q" name="q" defaultValue={query.q ?? ""} className="field-input" maxLength={100} />
        </div>
        <div className="w-40">
          <label htmlFor="item" className="field-label">
            Syllabus item code
          </label>
          <input id="item" name="item" defaultValue={query.item ?? ""} className="field-input" placeholder="AER-03" maxLength={20} />
        </div>
        <input type="hidden" name="sort" value={query.sort} />
        <input type="hidden" name="dir" value={query.dir} />
        <button type="submit" className="btn-quiet">
          Filter
        </button>
        {(query.q || query.item) && (
          <Link href="/briefings" className="btn-quiet">
            Clear
          </Link>
        )}
      </form>
      <section aria-labelledby="list-title" className="card">
        <h2 id="list-title" className="sr-only">
          Briefings found
        </h2>
        <p className="text-caption text-ink-soft" aria-live="polite" data-testid="briefings-total">
          {result.total === 0
            ? "No briefings found."
            : `${result.total} briefing${result.total === 1 ? "" : "s"} · page ${query.page} of ${pages}`}
        </p>
        {result.rows.length > 0 && (
          <div className="mt-2">
            <WideTable label="Briefings table (scrolls sideways on small screens)" more={4}>
              <table className="data-table" data-testid="briefings-table">
                <thead>
                  <tr>
                    {COLUMNS.map((c) => {
                      const active = query.sort === c.key;
                      const nextDir = active && query.dir === "asc" ? "desc" : "asc";
                      return (
                        <th
                          key={c.key}
                          scope="col"
                          data-more={c.key === "revision" || c.key === "updated" ? "" : undefined}
                          aria-sort={active ? (query.dir === "asc" ? "ascending" : "descending") : "none"}
                        >
                          <Link href={href({ sort: c.key, dir: nextDir, page: 1 })} className="inline-flex min-h-10 items-center gap-1">
                            {c.label}
                            <span aria-hidden="true">{active ? (query.dir === "asc" ? "▲" : "▼") : ""}</span>
                            {active && <span className="sr-only">, sorted {query.dir === "asc" ? "ascending" : "descending"}</span>}
                          </Link>
                        </th>
                      );
                    })}
                    <th scope="col" data-more="">
                      Syllabus items
                    </th>
                    <th scope="col" data-more="">
                      Handouts · demos
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {result.rows.map((b) => (
                    <tr key={b.id}>
                      <td>
                        <Link href={`/briefings/${b.id}`} className="font-semibold">
                          {b.title}
                        </Link>
                      </td>
                      <td className="num">{b.minutes}</td>
                      <td className="num" data-more="">
                        {b.revisionNumber}
                      </td>
                      <td className="num" data-more="">
                        {formatDay(new Date(b.updatedAt), school.timeZone)}
                        {/* who revised it is staff information */}
                        {!isStudent && <span className="text-ink-soft"> · {b.updatedByName}</span>}
                      </td>
                      <td className="num" data-more="">
                        {b.itemCodes.join(", ") || "—"}
                      </td>
                      <td className="num" data-more="">
                        {b.handouts} · {b.demos}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </WideTable>
          </div>
        )}
        {pages > 1 && (
          <nav aria-label="Pages" className="mt-3 flex items-center gap-2">
            {query.page > 1 ? (
              <Link className="btn-quiet" href={href({ page: query.page - 1 })}>
                Previous page
              </Link>
            ) : null}
            <span className="text-caption text-ink-soft">
              Page {query.page} of {pages}
            </span>
            {query.page < pages ? (
              <Link className="btn-quiet" href={href({ page: query.page + 1 })}>
                Next page
              </Link>
            ) : null}
          </nav>
        )}
      </section>
    </div>
  );
}
