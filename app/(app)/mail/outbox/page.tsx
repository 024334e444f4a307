import type { Metadata } from "next";
import Link from "next/link";
import { z } from "zod";
import { requirePagePermission } from "@/lib/auth/guard";
import { OUTBOX_STATES, listOutbox, outboxCounts } from "@/db/access/mail/outbox-list";
import { getSchool } from "@/db/access/shared/school";
import { OutboxTable } from "../_components/outbox-table";
import { MailTabs } from "../_components/mail-tabs";

export const metadata: Metadata = { title: "Outbox" };
export const dynamic = "force-dynamic";

const query = z.object({ state: z.enum(OUTBOX_STATES).optional() });

export default async function OutboxPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("mail.tray", "/mail/outbox");
  const school = await getSchool(user.schoolId);
  const parsed = query.safeParse(await searchParams);
  const state = parsed.success ? parsed.data.state : undefined;
  const [rows, counts] = await Promise.all([listOutbox(user.schoolId, { state }), outboxCounts(user.schoolId)]);
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-display">Outbox</h1>
        <p className="text-ink-soft">
          Every mail the school sends passes through here: queued until the worker sends it, then sent; failed after its retries ran out.
        </p>
      </div>
      <MailTabs current="/mail/outbox" show={["/mail", "/mail/outbox", "/mail/notes"]} />
      {!parsed.success && (
        <p role="alert" className="field-error">
          state: not one of {OUTBOX_STATES.join(", ")}; showing all.
        </p>
      )}
      <nav aria-label="Filter by state" className="flex flex-wrap gap-2">
        <Link
          href="/mail/outbox"
          aria-current={!state ? "page" : undefined}
          className={!state ? "btn bg-wing-700 text-white" : "btn-quiet"}
        >
          All
        </Link>
        {OUTBOX_STATES.map((s) => (
          <Link
            key={s}
            href={`/mail/outbox?state=${s}`}
            aria-current={state === s ? "page" : undefined}
            className={state === s ? "btn bg-wing-700 text-white" : "btn-quiet"}
          >
            {s} <span className="num">({counts[s]})</span>
          </Link>
        ))}
      </nav>
      <OutboxTable rows={rows} timeZone={school.timeZone} />
    </div>
  );
}
