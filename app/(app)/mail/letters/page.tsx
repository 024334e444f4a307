import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can, HttpError } from "@/lib/auth/guard";
import { letterLink, letterLinksPage } from "@/db/access/mail/letter-links";
import { studentListQuerySchema } from "@/lib/records/schema";
import { ListPageNav } from "@/components/student-pages";
import { fieldLabel } from "@/lib/validation/messages";
import { getSchool } from "@/db/access/shared/school";
import { composeLetterFor } from "@/lib/mail/producers";
import { now } from "@/lib/clock";
import { formatDayTime } from "@/lib/time";
import { MailTabs } from "../_components/mail-tabs";
import { SendLetterButton } from "../_components/send-letter-button";

export const metadata: Metadata = { title: "Weekly letters" };
export const dynamic = "force-dynamic";

const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v) ?? "";

export default async function WeeklyLettersPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePagePermission("mail.letters", "/mail/letters");
  const q = await searchParams;
  // one page of the links (a part of a sponsor's or student's name to narrow them), whatever the number of sponsors
  const listQuery = studentListQuerySchema.pick({ name: true, page: true }).safeParse({ name: one(q.name), page: one(q.page) });
  const list = listQuery.success ? listQuery.data : {};
  const [school, linksPage] = await Promise.all([
    getSchool(user.schoolId),
    letterLinksPage(user.schoolId, { name: list.name }, { page: list.page ?? 1 }),
  ]);
  const links = linksPage.rows;
  const listPairs: [string, string][] = list.name ? [["name", list.name]] : [];
  // a preview keeps the list where it was (its filter and page)
  const previewHref = (sponsor: string, student: string) =>
    `/mail/letters?${new URLSearchParams([
      ["sponsor", sponsor],
      ["student", student],
      ...listPairs,
      ...(linksPage.page > 1 ? ([["page", String(linksPage.page)]] as [string, string][]) : []),
    ]).toString()}`;
  const sponsorId = one(q.sponsor);
  const studentId = one(q.student);
  let preview: { link: Awaited<ReturnType<typeof letterLink>>; subject: string; text: string } | null = null;
  let previewError: string | null = null;
  if (sponsorId || studentId) {
    try {
      const link = await letterLink(user.schoolId, sponsorId, studentId);
      const { mail } = await composeLetterFor(link, school, now());
      preview = { link, subject: mail.subject, text: mail.text };
    } catch (e) {
      if (!(e instanceof HttpError)) throw e;
      previewError = "No such sponsor and student at this school.";
    }
  }
  const status = (l: (typeof links)[number]) =>
    l.stopped ? "Stopped by the sponsor" : l.agreed ? "Receives the letter" : "Not agreed by the student";
  return (
    <div className="max-w-4xl space-y-6">
      <div>
        <h1 className="text-display">Weekly letters</h1>
        <p className="text-ink-soft">
          Each sponsor&apos;s next Weekly letter as it would be written now, and a way to send it at once. The letter covers the seven days
          before it is written and the seven after; the usual one then does not go out again this week.
        </p>
      </div>
      {can(user, "mail.tray") && <MailTabs current="/mail/letters" show={["/mail", "/mail/outbox", "/mail/notes", "/mail/letters"]} />}
      {previewError && (
        <p className="card" role="alert">
          {previewError}
        </p>
      )}
      {preview && (
        <section className="card space-y-3" aria-labelledby="preview-title">
          <h2 id="preview-title" className="text-lead font-semibold">
            Next letter to {preview.link.sponsorName} about {preview.link.studentName}
          </h2>
          <p className="break-words">
            <span className="text-ink-soft">Subject:</span> {preview.subject}
          </p>
          <pre className="whitespace-pre-wrap break-words font-sans" data-testid="letter-preview">
            {preview.text}
          </pre>
          {can(user, "sharing.students") && (
            <p className="text-caption">
              <Link href={`/sharing/${preview.link.studentId}`} className="underline">
                What {preview.link.studentName} shares with their sponsors
              </Link>
            </p>
          )}
          {preview.link.agreed && !preview.link.stopped ? (
            <SendLetterButton sponsorId={preview.link.sponsorId} studentId={preview.link.studentId} />
          ) : (
            <p>{status(preview.link)}: it cannot be sent.</p>
          )}
        </section>
      )}
      <section aria-labelledby="links-title" className="space-y-2">
        <h2 id="links-title" className="text-lead font-semibold">
          Sponsors and their students
        </h2>
        {(linksPage.total > linksPage.pageSize || list.name || linksPage.page > 1 || !listQuery.success) && (
          <form method="get" className="card flex flex-wrap items-end gap-3" aria-label="Find a sponsor or student">
            <div className="min-w-0 flex-1">
              <label htmlFor="letters-name" className="field-label">
                Sponsor or student name contains
              </label>
              <input id="letters-name" name="name" type="search" maxLength={100} defaultValue={list.name ?? ""} className="field-input" />
            </div>
            <button type="submit" className="btn-primary">
              Show
            </button>
            {list.name && (
              <Link href="/mail/letters" className="btn-quiet">
                Clear
              </Link>
            )}
          </form>
        )}
        {!listQuery.success && (
          <p role="alert" className="text-notyet-800">
            {fieldLabel(listQuery.error.issues[0]?.path ?? [])}: {listQuery.error.issues[0]?.message}. Showing every link instead.
          </p>
        )}
        {links.length === 0 ? (
          <p className="card">
            {linksPage.page > 1
              ? `Nothing on page ${linksPage.page}.`
              : list.name
                ? "No sponsor or student matches."
                : "No sponsor is linked to a student."}
          </p>
        ) : (
          <ul className="card divide-y divide-paper-edge" aria-label="Sponsors and their students" data-testid="letter-links">
            {links.map((l) => (
              <li key={`${l.sponsorId}:${l.studentId}`} className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 py-3">
                <div className="min-w-0">
                  <p className="font-semibold break-words">
                    {l.sponsorName} <span className="font-normal text-ink-soft">about</span> {l.studentName}
                  </p>
                  <p className="text-caption text-ink-soft">
                    {status(l)} · last sent{" "}
                    <span className="num">{l.lastSentAt ? formatDayTime(new Date(l.lastSentAt), school.timeZone) : "never"}</span>
                    {can(user, "sharing.students") && (
                      <>
                        {" "}
                        ·{" "}
                        <Link href={`/sharing/${l.studentId}`} className="underline">
                          what {l.studentName} shares
                        </Link>
                      </>
                    )}
                  </p>
                </div>
                <Link href={previewHref(l.sponsorId, l.studentId)} className="btn-quiet">
                  Preview
                  <span className="sr-only">
                    {" "}
                    the letter to {l.sponsorName} about {l.studentName}
                  </span>
                </Link>
              </li>
            ))}
          </ul>
        )}
        <ListPageNav
          basePath="/mail/letters"
          pairs={listPairs}
          page={linksPage.page}
          pageSize={linksPage.pageSize}
          shown={links.length}
          total={linksPage.total}
          label="Sponsors and their students, pages"
          testId="letter-links-pages"
          noun="Links"
        />
      </section>
    </div>
  );
}
