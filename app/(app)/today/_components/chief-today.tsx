import Link from "next/link";
import { ScrollArea } from "@/components/ui/scroll-area";
import { schoolOverview, RECENCY_WARNING_DAYS } from "@/db/access/today/school-overview";
import type { CurrentUser } from "@/lib/auth/session";
import { UnlockButton } from "./unlock-button";
import { formatDay } from "@/lib/time";

export async function ChiefToday({ user }: { user: CurrentUser }) {
  const { counts, locked, currency, dueSoon } = await schoolOverview(user);
  return (
    <section aria-labelledby="chief-title" className="space-y-4">
      <h2 id="chief-title" className="sr-only">
        School overview
      </h2>
      <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
        {[
          ["Students", counts.students],
          ["Instructors", counts.instructors],
          ["Cohorts", counts.cohorts],
          ["Sponsors", counts.sponsors],
        ].map(([label, value]) => (
          <div key={label} className="card">
            <dt className="text-caption font-semibold text-ink-soft">{label}</dt>
            <dd className="num text-display">{value}</dd>
          </div>
        ))}
      </dl>
      {dueSoon.length > 0 && (
        <section className="card" aria-labelledby="recency-due-title" data-testid="recency-due">
          <h2 id="recency-due-title">Recency dates within {RECENCY_WARNING_DAYS} days</h2>
          <ul className="mt-2 space-y-1">
            {dueSoon.map((d) => (
              <li key={`${d.personId}-${d.certificateNumber}`}>
                <Link href={`/people/${d.personId}`}>{d.name}</Link> <span className="num">({d.certificateNumber})</span>:{" "}
                {d.daysLeft <= 0
                  ? `recency lapsed on ${formatDay(d.dueOn)}; signing is refused until the renewal is recorded`
                  : `recency date ${formatDay(d.dueOn)}, in ${d.daysLeft} day${d.daysLeft === 1 ? "" : "s"}; signing is refused from that day`}
              </li>
            ))}
          </ul>
        </section>
      )}
      <div className="grid gap-4 md:grid-cols-2">
        <section className="card" aria-labelledby="currency-title">
          <h2 id="currency-title">Instructor currency</h2>
          <ScrollArea label="Instructor currency, scrolls sideways" className="mt-2">
            <table className="data-table">
              <thead>
                <tr>
                  <th scope="col">Instructor</th>
                  <th scope="col">Certificate</th>
                  <th scope="col">Recency due</th>
                </tr>
              </thead>
              <tbody>
                {currency.map((c) => (
                  <tr key={c.certificateNumber}>
                    <td>{c.name}</td>
                    <td className="num">{c.certificateNumber}</td>
                    <td className="num">
                      {formatDay(c.dueOn)}{" "}
                      {c.overdue && (
                        <span className="ml-1 rounded bg-notyet-100 px-1.5 text-caption font-semibold text-notyet-800">lapsed</span>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollArea>
        </section>
        <section className="card" aria-labelledby="locks-title">
          <h2 id="locks-title">Locked sign-ins</h2>
          {locked.length === 0 ? (
            <p className="mt-2 text-ink-soft">No account is locked.</p>
          ) : (
            <ul className="mt-2 space-y-2" data-testid="locked-accounts">
              {locked.map((l) => (
                <li key={`${l.personId}-${l.address}`} className="flex flex-wrap items-center justify-between gap-2">
                  <span>
                    {l.name} <span className="text-caption text-ink-soft">({l.email})</span>
                  </span>
                  <UnlockButton personId={l.personId} name={l.name} />
                </li>
              ))}
            </ul>
          )}
        </section>
      </div>
    </section>
  );
}
