import type { OutboxListRow, OutboxState } from "@/db/access/mail/outbox-list";
import { formatDayTime } from "@/lib/time";
import { RetryButton } from "./retry-button";
import { WideTable } from "@/components/ui/wide-table";
import { MAIL_KIND_WORDS, MAIL_STATE_WORDS, words } from "@/lib/labels";

const STATE_STYLE: Record<OutboxState, string> = {
  queued: "bg-wing-50 text-wing-800",
  sent: "bg-solid-100 text-solid-800",
  failed: "bg-notyet-100 text-notyet-800",
  cancelled: "bg-paper-deep text-ink-soft",
};

export function StateBadge({ state }: { state: OutboxState }) {
  return (
    <span className={`inline-block rounded px-2 py-0.5 text-caption font-semibold ${STATE_STYLE[state]}`}>{MAIL_STATE_WORDS[state]}</span>
  );
}

/** The outbox as a table: state in words (never colour alone), attempts, error, and a retry for failed mail. */
export function OutboxTable({ rows, timeZone }: { rows: OutboxListRow[]; timeZone: string }) {
  if (rows.length === 0) return <p className="text-ink-soft">No mail here.</p>;
  const when = (d: Date | null) => (d ? formatDayTime(new Date(d), timeZone) : "—");
  return (
    <WideTable label="Outbox" more={5}>
      <table className="data-table" data-testid="outbox-table">
        <thead>
          <tr>
            <th scope="col">State</th>
            <th scope="col">Kind</th>
            <th scope="col">Subject</th>
            <th scope="col" data-more="">
              To
            </th>
            <th scope="col" data-more="">
              Due
            </th>
            <th scope="col" data-more="">
              Sent
            </th>
            <th scope="col" data-more="">
              Attempts
            </th>
            <th scope="col" data-more="">
              Last error
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.id}>
              <td>
                <StateBadge state={r.state} />
                {/* the retry sits with the state, so it is there on a phone without "More columns" */}
                {r.state === "failed" && (
                  <div className="mt-1">
                    <RetryButton outboxId={r.id} />
                  </div>
                )}
              </td>
              <td className="whitespace-nowrap">{words(MAIL_KIND_WORDS, r.kind)}</td>
              <td className="[overflow-wrap:anywhere]">{r.subject}</td>
              <td className="break-all" data-more="">
                {r.to}
              </td>
              <td className="num whitespace-nowrap" data-more="">
                {when(r.dueAt)}
              </td>
              <td className="num whitespace-nowrap" data-more="">
                {when(r.sentAt)}
              </td>
              <td className="num" data-more="">
                {r.attempts}
              </td>
              <td className="text-caption" data-more="">
                {r.lastError ?? "—"}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </WideTable>
  );
}
