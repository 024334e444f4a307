"use client";
import Link from "next/link";
import { useQuery } from "@tanstack/react-query";

interface FocusList {
  title: string;
  rows: { id: string; primary: string; secondary: string; href?: string }[];
  total: number;
  more?: { href: string; label: string };
}

export function FocusList() {
  const { data, isPending, isError } = useQuery<FocusList>({
    queryKey: ["today"],
    queryFn: async () => {
      const res = await fetch("/api/today", { headers: { accept: "application/json" } });
      if (!res.ok) throw new Error(`today: ${res.status}`);
      return res.json() as Promise<FocusList>;
    },
  });
  return (
    <section className="card" aria-labelledby="focus-title" aria-busy={isPending}>
      <h2 id="focus-title">{data?.title ?? "Loading…"}</h2>
      {isError && (
        <p role="alert" className="mt-2 text-notyet-800">
          Could not load this list. Reload the page to try again.
        </p>
      )}
      {data && data.rows.length === 0 && <p className="mt-2 text-ink-soft">Nothing here yet.</p>}
      {data && data.total > data.rows.length && (
        <p className="mt-2 text-caption text-ink-soft" data-testid="focus-count">
          The first <span className="num">{data.rows.length}</span> of <span className="num">{data.total.toLocaleString("en-GB")}</span>:
        </p>
      )}
      {data && data.rows.length > 0 && (
        <ul className="mt-3 divide-y divide-paper-edge" data-testid="focus-list">
          {data.rows.map((r) => (
            <li key={r.id} className="flex flex-wrap items-baseline justify-between gap-x-4 py-2">
              {r.href ? (
                <Link href={r.href} className="font-medium underline">
                  {r.primary}
                </Link>
              ) : (
                <span className="font-medium">{r.primary}</span>
              )}
              <span className="text-caption text-ink-soft">{r.secondary}</span>
            </li>
          ))}
        </ul>
      )}
      {data?.more && data.total > data.rows.length && (
        <Link href={data.more.href} className="mt-1 inline-block min-h-touch py-2 text-caption underline">
          {data.more.label}
        </Link>
      )}
    </section>
  );
}
