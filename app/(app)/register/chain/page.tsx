import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission } from "@/lib/auth/guard";
import { CHAIN_PAGE_CHECK_LIMIT, chainPageData } from "@/db/access/records/chain-page";
import { formatDayTime } from "@/lib/time";
import { ScrollArea } from "@/components/ui/scroll-area";
import { walkView } from "@/lib/records/audit-walk-view";
import { FullWalk } from "./_components/full-walk";

export const metadata: Metadata = { title: "Audit chain" };
export const dynamic = "force-dynamic";

const n = (x: number) => x.toLocaleString("en-GB");

export default async function ChainPage() {
  const user = await requirePagePermission("audit.verify", "/register/chain");
  const { v, walk, events, school } = await chainPageData(user.schoolId);
  const at = (d: Date) => formatDayTime(d, school.timeZone, { seconds: true });
  const newer = v.checked - v.since;
  return (
    <div className="space-y-6">
      <header>
        <p className="text-caption">
          <Link className="underline" href="/register">
            Sign-off register
          </Link>
        </p>
        <h1 className="text-display">Audit chain</h1>
        <p className="text-ink-soft">
          Each audit event&apos;s hash covers the previous hash and the event, so a change, removal, insertion or reordering breaks the
          chain from that point.
        </p>
      </header>
      <section
        className={`card border-l-4 ${v.ok ? "border-l-solid-600" : "border-l-notyet-600"}`}
        aria-labelledby="result"
        data-testid="chain-result"
      >
        <h2 id="result">
          {v.ok ? (v.unchecked > 0 ? "The chain verifies as far as checked" : "The chain verifies") : "The chain is broken"}
        </h2>
        <p>
          {v.busy
            ? `Another visit was checking the newest events at the same moment, so this shows the chain as of the last check${v.sinceVerifiedAt ? ` (${at(v.sinceVerifiedAt)})` : ""}.`
            : v.ok && newer === 0 && v.since > 0
              ? `Checked on opening this page: no event was written since the last check (position ${n(v.since)}, ${at(v.sinceVerifiedAt!)}).`
              : v.since === 0
                ? "Checked on opening this page: the events from position 1 (no earlier check was on file)."
                : `Checked on opening this page: the events after position ${n(v.since)}, written since the last check of ${at(v.sinceVerifiedAt!)}. Positions 1 to ${n(v.since)} were verified then and are checked again only by a full walk.`}
        </p>
        <p>
          {v.busy && v.checked === 0
            ? "No check of the chain is on file yet."
            : v.ok
              ? `Positions 1 to ${n(v.checked)} verify; the checkpoint ${v.busy ? "stands" : "now stands"} at position ${n(v.checked)}.`
              : `Positions up to ${n(v.checked)} link up; the first broken link is at position ${n(v.broken?.position ?? 0)}: ${v.broken?.problem}. The checkpoint stays at position ${n(v.since)}.`}
        </p>
        {v.unchecked > 0 && (
          <p>
            {`${n(v.unchecked)} later events are not checked yet: each visit checks up to ${n(CHAIN_PAGE_CHECK_LIMIT)} more, and a full walk checks them all.`}
          </p>
        )}
        <p className="num break-all text-caption">Head hash {v.headHash}</p>
      </section>
      <FullWalk initial={walk ? walkView(walk) : null} timeZone={school.timeZone} />
      <section className="card" aria-labelledby="latest">
        <h2 id="latest">Latest events</h2>
        <ScrollArea label="Latest audit events" className="mt-2">
          <table className="data-table text-caption">
            <thead>
              <tr>
                <th scope="col">#</th>
                <th scope="col">When</th>
                <th scope="col">Who</th>
                <th scope="col">What</th>
                <th scope="col">Hash</th>
              </tr>
            </thead>
            <tbody>
              {events.map((e) => (
                <tr key={e.id}>
                  <td className="num">{e.position}</td>
                  <td className="num whitespace-nowrap">{formatDayTime(e.occurredAt, school.timeZone, { seconds: true })}</td>
                  <td>{e.actorName ?? "—"}</td>
                  <td>
                    {e.action} · {e.recordType}
                  </td>
                  <td className="num">{e.hash.slice(0, 16)}…</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollArea>
      </section>
    </div>
  );
}
