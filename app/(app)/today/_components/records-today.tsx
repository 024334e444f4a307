import Link from "next/link";
import { chiefRecordsSummary } from "@/db/access/records/chief-summary";
import type { CurrentUser } from "@/lib/auth/session";

/** The chief's Records card on Today: how many stage checks wait and the longest waiting, watch notes, the chain's status. */
export async function RecordsToday({ user }: { user: CurrentUser }) {
  const { waiting, waitingTotal, notes, chain } = await chiefRecordsSummary(user);
  return (
    <section className="card space-y-3" aria-labelledby="records-today-title" data-testid="records-today">
      <h2 id="records-today-title">Records</h2>
      <div className="grid gap-4 md:grid-cols-3">
        <div data-testid="stages-waiting">
          <h3 className="font-semibold">Stage checks waiting</h3>
          {waitingTotal === 0 ? (
            <p className="text-ink-soft">None waiting.</p>
          ) : (
            <>
              <p className="text-caption text-ink-soft">
                <span className="num">{waitingTotal.toLocaleString("en-GB")}</span> stage{waitingTotal === 1 ? "" : "s"} ready for the check
                {waitingTotal > waiting.length ? `; the ${waiting.length} waiting longest:` : ":"}
              </p>
              <ul className="text-caption">
                {waiting.map((w) => (
                  <li key={`${w.studentId}-${w.stageCode}`}>
                    <Link className="underline" href={`/records/${w.studentId}`}>
                      {w.studentName}
                    </Link>{" "}
                    · {w.stageCode} · {w.days === null ? "ready" : `waiting ${w.days} day${w.days === 1 ? "" : "s"}`}
                  </li>
                ))}
              </ul>
              {waitingTotal > waiting.length && (
                <Link href="/records" className="text-caption underline">
                  Every student in Records
                </Link>
              )}
            </>
          )}
        </div>
        <div>
          <h3 className="font-semibold">Watch notes</h3>
          {notes.length === 0 ? (
            <p className="text-ink-soft">None.</p>
          ) : (
            <ul className="text-caption">
              {notes.slice(0, 5).map((n, i) => (
                <li key={`${n.recordId}-${i}`}>
                  {n.label}: {n.studentName}
                  {n.itemCode ? ` ${n.itemCode}` : ""}
                </li>
              ))}
            </ul>
          )}
          <Link href="/register" className="text-caption underline">
            All {notes.length} in the Sign-off register
          </Link>
        </div>
        <div>
          <h3 className="font-semibold">Audit chain</h3>
          <p className={chain.ok ? "font-semibold text-solid-800" : "font-semibold text-notyet-800"}>
            {chain.ok
              ? `Verifies (${chain.checked} events${chain.unchecked > 0 ? `; ${chain.unchecked} later events not checked yet` : ""})`
              : `Broken at position ${chain.broken?.position}`}
          </p>
          <Link href="/register/chain" className="text-caption underline">
            Check the chain
          </Link>
        </div>
      </div>
    </section>
  );
}
