"use client";
import Link from "next/link";
import { useState } from "react";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { SessionRow } from "@/db/access/timetable/list-sessions";
import { WideTable } from "@/components/ui/wide-table";
import { formatDay } from "@/lib/time";
import { apiErrorText } from "@/lib/validation/messages";
import { ChoiceField } from "@/components/search-picker";
import type { PickerChoices, PickerOption } from "@/lib/directory/picker";

interface Page {
  rows: SessionRow[];
  total: number;
  page: number;
  pageSize: number;
  pages: number;
}

type Sort = "starts_at" | "briefing" | "room" | "instructor" | "cohort";
/** `more`: below 768 px these wait behind "More columns" (components/ui/wide-table.tsx). */
const COLUMNS: { key: Sort | null; label: string; more?: boolean }[] = [
  { key: "starts_at", label: "When" },
  { key: "briefing", label: "Briefing" },
  { key: "room", label: "Room" },
  { key: "instructor", label: "Instructor", more: true },
  { key: "cohort", label: "Cohort", more: true },
  { key: null, label: "Status", more: true },
];

/** The list view: server-side sorting, filtering and pages through GET /api/sessions. */
export function SessionsTable({
  staff,
  initial,
  instructors,
  instructor,
  cohorts,
  cohort,
  rooms,
}: {
  staff: boolean;
  initial: Record<string, string>;
  /** listed while few, else searched (GET /api/directory/instructors) */
  instructors: PickerChoices;
  /** the instructor of the initial filter, named for the search picker */
  instructor?: PickerOption | null;
  /** listed while few, else searched (GET /api/directory/cohorts) */
  cohorts: PickerChoices;
  /** the cohort of the initial filter, named for the search picker */
  cohort?: PickerOption | null;
  rooms: string[];
}) {
  const [params, setParams] = useState<Record<string, string>>({
    sort: "starts_at",
    dir: "asc",
    status: "all",
    page: "1",
    pageSize: "20",
    ...initial,
  });
  const qs = new URLSearchParams(Object.entries(params).filter(([, v]) => v !== "")).toString();
  const { data, error, isPending } = useQuery<Page, Error>({
    queryKey: ["sessions", qs],
    placeholderData: keepPreviousData,
    queryFn: async () => {
      const res = await fetch(`/api/sessions?${qs}`, { headers: { accept: "application/json" } });
      const body = await res.json();
      if (!res.ok) throw new Error(apiErrorText(body?.error, `The sessions could not be loaded (${res.status}).`));
      return body as Page;
    },
  });
  const set = (patch: Record<string, string>) => setParams((p) => ({ ...p, page: "1", ...patch }));
  const sortBy = (key: Sort) => set({ sort: key, dir: params.sort === key && params.dir === "asc" ? "desc" : "asc" });
  return (
    <section className="card space-y-3" aria-labelledby="list-title" aria-busy={isPending}>
      <h2 id="list-title">Sessions</h2>
      <div className="flex flex-wrap items-end gap-3">
        <div>
          <label htmlFor="l-from" className="field-label">
            From
          </label>
          <input
            id="l-from"
            type="date"
            className="field-input"
            value={params.from ?? ""}
            onChange={(e) => set({ from: e.target.value })}
          />
        </div>
        <div>
          <label htmlFor="l-to" className="field-label">
            To
          </label>
          <input id="l-to" type="date" className="field-input" value={params.to ?? ""} onChange={(e) => set({ to: e.target.value })} />
        </div>
        <div>
          <label htmlFor="l-status" className="field-label">
            Status
          </label>
          <select id="l-status" className="field-input" value={params.status} onChange={(e) => set({ status: e.target.value })}>
            <option value="all">Scheduled and cancelled</option>
            <option value="scheduled">Scheduled</option>
            <option value="cancelled">Cancelled</option>
          </select>
        </div>
        {staff && (
          <>
            <ChoiceField
              id="l-instructor"
              name="instructor"
              label="Instructor"
              emptyLabel="Any instructor"
              placeholder="Any instructor: type a name"
              choices={instructors}
              defaultValue={params.instructor ?? ""}
              initial={instructor}
              endpoint="/api/directory/instructors"
              params={{ purpose: "timetable" }}
              onChange={(i) => set({ instructor: i?.id ?? "" })}
            />
            <ChoiceField
              id="l-cohort"
              name="cohort"
              label="Cohort"
              emptyLabel="Any cohort"
              placeholder="Any cohort: type a name"
              choices={cohorts}
              defaultValue={params.cohort ?? ""}
              initial={cohort}
              endpoint="/api/directory/cohorts"
              params={{ purpose: "timetable" }}
              onChange={(c) => set({ cohort: c?.id ?? "" })}
            />
            <div>
              <label htmlFor="l-room" className="field-label">
                Room
              </label>
              <select id="l-room" className="field-input" value={params.room ?? ""} onChange={(e) => set({ room: e.target.value })}>
                <option value="">Any room</option>
                {rooms.map((r) => (
                  <option key={r} value={r}>
                    {r}
                  </option>
                ))}
              </select>
            </div>
            <label className="flex min-h-touch items-center gap-2">
              <input
                type="checkbox"
                className="h-5 w-5"
                checked={params.mine === "1"}
                onChange={(e) => set({ mine: e.target.checked ? "1" : "" })}
              />
              Only mine
            </label>
          </>
        )}
      </div>
      <div aria-live="polite">
        {error && (
          <p role="alert" className="field-error">
            {error.message}
          </p>
        )}
      </div>
      <WideTable label="Sessions, scrolls sideways" more={COLUMNS.filter((c) => c.more).length}>
        <table className="data-table" data-testid="sessions-table">
          <thead>
            <tr>
              {COLUMNS.map((c) => (
                <th
                  key={c.label}
                  scope="col"
                  data-more={c.more ? "" : undefined}
                  aria-sort={c.key && params.sort === c.key ? (params.dir === "asc" ? "ascending" : "descending") : undefined}
                >
                  {c.key ? (
                    <button type="button" className="min-h-touch uppercase" onClick={() => sortBy(c.key!)}>
                      {c.label}
                      {params.sort === c.key ? (params.dir === "asc" ? " ↑" : " ↓") : ""}
                    </button>
                  ) : (
                    c.label
                  )}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {data?.rows.map((s) => (
              <tr key={s.id}>
                <td className="num">
                  <span className="whitespace-nowrap">{formatDay(s.date)}</span>{" "}
                  <span className="whitespace-nowrap">
                    {s.startLocal}–{s.endLocal}
                  </span>
                </td>
                <td>
                  <Link href={`/timetable/${s.id}`}>{s.briefingTitle}</Link>
                </td>
                <td>{s.room}</td>
                <td data-more="">{s.instructorName}</td>
                <td data-more="">{s.cohortName ?? "Individual students"}</td>
                <td data-more="">
                  {/* whether attendance was recorded is staff business: a student sees only scheduled or cancelled */}
                  {s.status === "cancelled" ? "Cancelled" : staff && s.recordedCount > 0 ? "Attendance recorded" : "Scheduled"}
                </td>
              </tr>
            ))}
            {data && data.rows.length === 0 && (
              <tr>
                <td colSpan={6} className="text-ink-soft">
                  No sessions match.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </WideTable>
      {data && (
        <nav aria-label="Pages" className="flex flex-wrap items-center gap-3">
          <button
            type="button"
            className="btn-quiet"
            disabled={data.page <= 1}
            onClick={() => setParams((p) => ({ ...p, page: String(data.page - 1) }))}
          >
            Previous page
          </button>
          <span className="num">
            Page {data.page} of {data.pages} · {data.total} sessions
          </span>
          <button
            type="button"
            className="btn-quiet"
            disabled={data.page >= data.pages}
            onClick={() => setParams((p) => ({ ...p, page: String(data.page + 1) }))}
          >
            Next page
          </button>
        </nav>
      )}
    </section>
  );
}
