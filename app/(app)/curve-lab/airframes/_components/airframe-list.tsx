"use client";
import { formatNumber } from "@/components/charts/format";
import Link from "next/link";
import { useState } from "react";
import { useQuery } from "@tanstack/react-query";
import { kgToLb } from "@/lib/aero";
import { ScrollArea } from "@/components/ui/scroll-area";

interface Row {
  id: string;
  name: string;
  emptyMassKg: number;
  maxMassKg: number;
  wingAreaM2: number;
  wingSpanM: number;
  retiredAt: string | null;
}

const fmt = formatNumber;

/** The school's aircraft profiles, from GET /api/airframes. */
export function AirframeList() {
  const [retired, setRetired] = useState(false);
  const q = useQuery({
    queryKey: ["airframes", retired],
    queryFn: async (): Promise<Row[]> => {
      const res = await fetch(`/api/airframes?retired=${retired ? "include" : "exclude"}`);
      if (!res.ok) throw new Error(`The profiles could not be loaded (${res.status}).`);
      return ((await res.json()) as { rows: Row[] }).rows;
    },
  });
  return (
    <div className="space-y-3">
      <label className="flex min-h-touch items-center gap-2">
        <input type="checkbox" className="h-5 w-5" checked={retired} onChange={(e) => setRetired(e.target.checked)} /> Show retired profiles
      </label>
      {q.isPending && <p aria-busy="true">Loading profiles…</p>}
      {q.isError && (
        <p role="alert" className="field-error">
          {q.error.message}
        </p>
      )}
      {q.data && q.data.length === 0 && <p className="text-ink-soft">No aircraft profiles yet.</p>}
      {q.data && q.data.length > 0 && (
        <ScrollArea label="List, scrolls sideways">
          <table className="data-table" data-testid="airframe-list">
            <thead>
              <tr>
                <th scope="col">Profile</th>
                <th scope="col">Mass, empty to max</th>
                <th scope="col">Wing</th>
                <th scope="col">State</th>
              </tr>
            </thead>
            <tbody>
              {q.data.map((a) => (
                <tr key={a.id}>
                  <td>
                    <Link href={`/curve-lab/airframes/${a.id}`} className="inline-flex min-h-touch items-center font-semibold">
                      {a.name}
                    </Link>
                  </td>
                  <td className="num">
                    {fmt(kgToLb(a.emptyMassKg))}–{fmt(kgToLb(a.maxMassKg))} lb ({fmt(a.emptyMassKg)}–{fmt(a.maxMassKg)} kg)
                  </td>
                  <td className="num">
                    {fmt(a.wingAreaM2, 1)} m² · span {fmt(a.wingSpanM, 2)} m
                  </td>
                  <td>{a.retiredAt ? "Retired" : "Available"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollArea>
      )}
    </div>
  );
}
