import type { Metadata } from "next";
import Link from "next/link";
import { z } from "zod";
import { simpleParser } from "mailparser";
import { requirePagePermission } from "@/lib/auth/guard";
import { listOutbox } from "@/db/access/mail/outbox-list";
import { listTray, mailTrayEnabled, readTrayMessage } from "@/db/access/mail/tray";
import { getSchool } from "@/db/access/shared/school";
import { formatDayTime } from "@/lib/time";
import { MAIL_KIND_WORDS, words } from "@/lib/labels";
import { decodeHeaderWords } from "@/lib/mail/mime-words";
import { OutboxTable } from "./_components/outbox-table";
import { MailTabs } from "./_components/mail-tabs";

export const metadata: Metadata = { title: "Mail tray" };
export const dynamic = "force-dynamic";

const query = z.object({
  m: z
    .string()
    .max(40)
    .regex(/^[a-z0-9-]+$/)
    .optional(),
});

// Development and demo only: the mail the local sink captured. With the tray off (production),
// the chief sees the outbox states instead.
export default async function MailTrayPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("mail.tray", "/mail");
  const school = await getSchool(user.schoolId);
  const tabs = ["/mail", "/mail/outbox", "/mail/notes"];
  if (!mailTrayEnabled()) {
    return (
      <div className="space-y-6">
        <h1 className="text-display">Mail tray</h1>
        <MailTabs current="/mail" show={tabs} />
        <p className="card" data-testid="tray-off">
          The Mail tray is off on this server: mail goes to the real mail service. These are the latest mails and their states.
        </p>
        <OutboxTable rows={await listOutbox(user.schoolId, { limit: 50 })} timeZone={school.timeZone} />
      </div>
    );
  }
  const parsedQuery = query.safeParse(await searchParams);
  // the sink's index keeps each subject as it travelled (RFC 2047 words); show it as recipients read it
  const messages = await Promise.all(
    (await listTray(user.schoolId)).map(async (m) => ({ ...m, subject: await decodeHeaderWords(m.subject) })),
  );
  const selectedId = (parsedQuery.success ? parsedQuery.data.m : undefined) ?? messages[0]?.id;
  const selected = selectedId ? await readTrayMessage(user.schoolId, selectedId) : null;
  const mail = selected ? await simpleParser(selected.raw) : null;
  const when = (iso: string) => formatDayTime(new Date(iso), school.timeZone, { seconds: true });
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-display">Mail tray</h1>
        <p className="text-ink-soft">Mail captured by the local mail service, as recipients would see it. Nothing here left the machine.</p>
      </div>
      <MailTabs current="/mail" show={tabs} />
      {!parsedQuery.success && (
        <p role="alert" className="field-error">
          m: not a message id; showing the newest.
        </p>
      )}
      {messages.length === 0 ? (
        <p className="card">No mail captured yet.</p>
      ) : (
        <div className="grid gap-6 lg:grid-cols-[minmax(0,22rem)_minmax(0,1fr)]">
          <section aria-labelledby="tray-list" className="card p-0">
            <h2 id="tray-list" className="px-4 pt-3 text-lead font-semibold">
              Captured ({messages.length})
            </h2>
            <ul className="mt-2 max-h-[70vh] overflow-y-auto" data-testid="tray-list">
              {messages.map((m) => (
                <li key={m.id} className="border-t border-paper-edge">
                  <Link
                    href={`/mail?m=${m.id}`}
                    aria-current={m.id === selectedId ? "true" : undefined}
                    className={`block min-h-touch px-4 py-2 no-underline hover:bg-paper-deep ${m.id === selectedId ? "bg-wing-50" : ""}`}
                  >
                    <span className="block font-semibold text-ink [overflow-wrap:anywhere]">{m.subject || "(no subject)"}</span>
                    <span className="block break-all text-caption text-ink-soft">
                      {m.envelopeTo.join(", ")} · {words(MAIL_KIND_WORDS, m.kind)} · <span className="num">{when(m.receivedAt)}</span>
                    </span>
                  </Link>
                </li>
              ))}
            </ul>
          </section>
          <section aria-labelledby="tray-message" className="card min-w-0 space-y-4">
            {!mail || !selected ? (
              <p>That message is not in the tray.</p>
            ) : (
              <>
                <h2 id="tray-message" className="text-title [overflow-wrap:anywhere]">
                  {mail.subject}
                </h2>
                <dl className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-4 gap-y-1 text-caption">
                  <dt className="text-ink-soft">From</dt>
                  <dd className="break-all">{mail.from?.text}</dd>
                  <dt className="text-ink-soft">To</dt>
                  <dd className="break-all">{selected.entry.envelopeTo.join(", ")}</dd>
                  <dt className="text-ink-soft">Received</dt>
                  <dd className="num">{when(selected.entry.receivedAt)}</dd>
                  <dt className="text-ink-soft">Message-ID</dt>
                  <dd className="break-all font-mono">{mail.messageId}</dd>
                  {mail.headerLines.some((h) => h.key === "list-unsubscribe") && (
                    <>
                      <dt className="text-ink-soft">One-click stop</dt>
                      <dd>yes (List-Unsubscribe-Post)</dd>
                    </>
                  )}
                </dl>
                <h3 className="font-semibold">As HTML</h3>
                {/* sandbox without allow-scripts: the mail's HTML cannot run code or reach the page */}
                <iframe
                  title={`HTML part of “${mail.subject ?? ""}”`}
                  sandbox=""
                  srcDoc={typeof mail.html === "string" ? mail.html : "<p>No HTML part</p>"}
                  className="h-[36rem] w-full rounded-md border border-paper-edge bg-white"
                  data-testid="tray-html"
                />
                <h3 className="font-semibold">As plain text</h3>
                <pre
                  className="max-h-[30rem] overflow-auto whitespace-pre-wrap break-words rounded-md bg-paper-deep p-3 font-mono text-caption"
                  data-testid="tray-text"
                  // a long mail scrolls inside the box: it takes keyboard focus so it can be scrolled without a mouse
                  tabIndex={0}
                  aria-label="The mail as plain text"
                >
                  {mail.text}
                </pre>
              </>
            )}
          </section>
        </div>
      )}
    </div>
  );
}
