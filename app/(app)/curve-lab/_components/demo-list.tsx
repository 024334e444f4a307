"use client";
import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { WideTable } from "@/components/ui/wide-table";
import { formatDay } from "@/lib/time";

interface Row {
  id: string;
  name: string;
  ownerName?: string;
  revisionNumber?: number;
  airframeName?: string;
  caseCount?: number;
  inUse?: boolean;
  dueOn?: string;
  viaBriefingTitle?: string | null;
}

/** The demos the caller may open, from GET /api/demos. */
export function DemoList({ staff }: { staff: boolean }) {
  const q = useQuery({
    queryKey: ["demos"],
    queryFn: async (): Promise<Row[]> => {
      const res = await fetch("/api/demos", { headers: { accept: "application/json" } });
      if (!res.ok) throw new Error(`The demos could not be loaded (${res.status}).`);
      return ((await res.json()) as { rows: Row[] }).rows;
    },
  });
  if (q.isPending) return <p aria-busy="true">Loading demos…</p>;
  if (q.isError)
    return (
      <p role="alert" className="field-error">
        {q.error.message}
      </p>
    );
  if (q.data.length === 0)
    return (
      <p className="text-ink-soft" data-testid="demo-list-empty">
        {staff ? "No demos yet: build one from an airframe." : "No demos are assigned to you yet."}
      </p>
    );
  return (
    <WideTable label="List, scrolls sideways" more={staff ? 3 : 1}>
      <table className="data-table" data-testid="demo-list">
        <thead>
          <tr>
            <th scope="col">Demo</th>
            {staff ? (
              <>
                <th scope="col">Airframe</th>
                <th scope="col" data-more="">
                  Cases
                </th>
                <th scope="col" data-more="">
                  Revision
                </th>
                <th scope="col" data-more="">
                  Owner
                </th>
                <th scope="col">Use</th>
              </>
            ) : (
              <>
                <th scope="col">Due</th>
                <th scope="col" data-more="">
                  Through
                </th>
              </>
            )}
          </tr>
        </thead>
        <tbody>
          {q.data.map((r) => (
            <tr key={r.id}>
              <td className="max-w-[24rem] [overflow-wrap:anywhere]">
                <Link href={`/curve-lab/demos/${r.id}`} className="inline-flex min-h-touch items-center font-semibold">
                  {r.name}
                </Link>
              </td>
              {staff ? (
                <>
                  <td>{r.airframeName}</td>
                  <td className="num" data-more="">
                    {r.caseCount}
                  </td>
                  <td className="num" data-more="">
                    {r.revisionNumber}
                  </td>
                  <td data-more="">{r.ownerName}</td>
                  <td>{r.inUse ? "In use" : "Not used yet"}</td>
                </>
              ) : (
                <>
                  <td className="num">{r.dueOn ? formatDay(r.dueOn) : "—"}</td>
                  <td data-more="">{r.viaBriefingTitle ?? "Assigned directly"}</td>
                </>
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </WideTable>
  );
}
