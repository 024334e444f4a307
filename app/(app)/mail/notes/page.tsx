import type { Metadata } from "next";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { recentNotes } from "@/db/access/mail/sponsor-notes";
import { studentChoices } from "@/db/access/directory/students";
import { getSchool } from "@/db/access/shared/school";
import { formatDayTime } from "@/lib/time";
import { MailTabs } from "../_components/mail-tabs";
import { NoteForm } from "../_components/note-form";

export const metadata: Metadata = { title: "Notes for sponsors" };
export const dynamic = "force-dynamic";

export default async function SponsorNotesPage() {
  const user = await requirePagePermission("sponsornotes.write", "/mail/notes");
  const [school, students, notes] = await Promise.all([getSchool(user.schoolId), studentChoices(user, "notes"), recentNotes(user)]);
  return (
    <div className="max-w-3xl space-y-6">
      <div>
        <h1 className="text-display">Notes for sponsors</h1>
        <p className="text-ink-soft">
          A short note about a student for their sponsors. The next Weekly letter carries the latest note of the past seven days. Sponsors
          read it as written: keep it plain and kind.
        </p>
      </div>
      {can(user, "mail.tray") && <MailTabs current="/mail/notes" show={["/mail", "/mail/outbox", "/mail/notes"]} />}
      {students.kind === "list" && students.rows.length === 0 ? (
        <p className="card">None of your students has a sponsor yet.</p>
      ) : (
        <NoteForm students={students} />
      )}
      <section aria-labelledby="recent-notes" className="card">
        <h2 id="recent-notes" className="text-lead font-semibold">
          Recent notes
        </h2>
        {notes.length === 0 ? (
          <p className="mt-2 text-ink-soft">No notes yet.</p>
        ) : (
          <ul className="mt-2 divide-y divide-paper-edge" data-testid="notes-list">
            {notes.map((n) => (
              <li key={n.id} className="py-3">
                <p className="text-caption text-ink-soft">
                  About <strong className="text-ink">{n.studentName}</strong> · by {n.authorName} ·{" "}
                  <span className="num">{formatDayTime(new Date(n.createdAt), school.timeZone)}</span>
                </p>
                <p className="mt-1 whitespace-pre-wrap break-words">{n.body}</p>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
