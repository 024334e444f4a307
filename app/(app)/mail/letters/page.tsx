import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can, HttpError } from "@/lib/auth/guard";
import { letterLink, letterLinks } from "@/db/access/mail/letter-links";
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
  const [school, links] = await Promise.all([getSchool(user.schoolId), letterLinks(user.schoolId)]);
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
        {links.length === 0 ? (
          <p className="card">No sponsor is linked to a student.</p>
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
                <Link href={`/mail/letters?sponsor=${l.sponsorId}&student=${l.studentId}`} className="btn-quiet">
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
      </section>
    </div>
  );
}
