import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission } from "@/lib/auth/guard";
import { verifyChain, listAuditEvents } from "@/db/access/records/audit-chain";
import { getSchool } from "@/db/access/shared/school";
import { formatDayTime } from "@/lib/time";
import { ScrollArea } from "@/components/ui/scroll-area";

export const metadata: Metadata = { title: "Audit chain" };
export const dynamic = "force-dynamic";

export default async function ChainPage() {
  const user = await requirePagePermission("audit.verify", "/register/chain");
  const [v, events, school] = await Promise.all([
    verifyChain(user.schoolId),
    listAuditEvents(user.schoolId, { limit: 30 }),
    getSchool(user.schoolId),
  ]);
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
        <h2 id="result">{v.ok ? "The chain verifies" : "The chain is broken"}</h2>
        <p>
          {v.ok
            ? `All ${v.checked} events link up.`
            : `${v.checked} events link up; the first broken link is at position ${v.broken?.position}: ${v.broken?.problem}.`}
        </p>
        <p className="num break-all text-caption">Head hash {v.headHash}</p>
      </section>
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
