import { QueryTypes } from "sequelize";
import type { SeedContext } from "./extensions";
import { sequelize } from "../index";
import { getSchool } from "../access/shared/school";
import { letterLink } from "../access/mail/letter-links";
import { enqueueLetter } from "@/lib/mail/producers";
import { addDays } from "@/lib/mail/letter-week";
import { formatInZone, zonedInstant } from "@/lib/time";

/**
 * Mail's demo data: a note from the lead instructor for the demo student's sponsor, so the next
 * Weekly letter carries one; and the Weekly letters of the past two letter days already sent to
 * the demo sponsor (composed from the demo data as it stands, written to the outbox, marked sent
 * with their delivery rows), so a sponsor signing in finds them in their history and the
 * unsubscribe link in each one works.
 */
export async function seedMail(ctx: SeedContext): Promise<void> {
  const student = ctx.students["student@chalkwing.test"];
  if (!student) return;
  await sequelize.query(`INSERT INTO sponsor_notes (school_id, student_id, author_id, body) VALUES (:s, :st, :a, :b)`, {
    replacements: {
      s: ctx.schoolId,
      st: student,
      a: ctx.people.instructor,
      b: "Clear answers this week on why the drag curve has a minimum, and good questions about flying below Vmd on the approach.",
    },
    transaction: ctx.t,
  });

  const school = await getSchool(ctx.schoolId, ctx.t);
  const link = await letterLink(ctx.schoolId, ctx.people.sponsor, student, ctx.t);
  const letterDay = school.settings.weeklyLetterDay; // 0 = Sunday … 6 = Saturday
  const today = ctx.day(0);
  const dow = Number(formatInZone(new Date(), school.timeZone, "i")) % 7; // 0 = Sunday
  const lastLetterDay = addDays(today, -((dow - letterDay + 7) % 7 || 7)); // strictly before today
  for (const date of [addDays(lastLetterDay, -7), lastLetterDay]) {
    const at = zonedInstant(date, "17:30", school.timeZone);
    await enqueueLetter(ctx.t, link, school, at);
    const [row] = await sequelize.query<{ id: string; message_id: string }>(
      `UPDATE outbox SET state = 'sent', attempts = 1, sent_at = :sent
        WHERE kind = 'weekly.letter' AND recipient_id = :sp AND due_at = :at AND state = 'queued' RETURNING id, message_id`,
      { replacements: { sp: ctx.people.sponsor, at, sent: new Date(at.getTime() + 60_000) }, type: QueryTypes.SELECT, transaction: ctx.t },
    );
    if (!row) continue;
    await sequelize.query(
      `INSERT INTO mail_deliveries (outbox_id, message_id, smtp_response, attempts, delivered_at) VALUES (:id, :mid, '250 OK (demo)', 1, :sent)`,
      { replacements: { id: row.id, mid: row.message_id, sent: new Date(at.getTime() + 60_000) }, transaction: ctx.t },
    );
  }
}
