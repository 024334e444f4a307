import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import type { LetterRecipient } from "./weekly-letter-recipients";
import { containsPattern } from "../shared/like";

// The school's sponsor links as the chief sees them on the Weekly letters page: whether each
// receives the letter (the student's consent and the sponsor's own unsubscribe), and the one link
// a preview or a "send now" is about.

export interface LetterLink extends LetterRecipient {
  /** the student agreed that this sponsor receives the letter */
  agreed: boolean;
  /** the sponsor stopped the letter themself */
  stopped: boolean;
  lastSentAt: Date | null;
}

const SELECT = `SELECT l.sponsor_id AS "sponsorId", sp.name AS "sponsorName", sp.email AS "sponsorEmail", l.student_id AS "studentId",
         st.name AS "studentName", l.weekly_letter AS agreed,
         json_build_object('shares_attendance', l.shares_attendance, 'shares_hours', l.shares_hours, 'shares_progress', l.shares_progress,
                           'shares_outcomes', l.shares_outcomes, 'shares_schedule', l.shares_schedule) AS flags,
         EXISTS (SELECT 1 FROM mail_unsubscribes u WHERE u.sponsor_id = l.sponsor_id AND u.student_id = l.student_id AND u.kind = 'weekly.letter') AS stopped,
         (SELECT max(d.delivered_at) FROM outbox o JOIN mail_deliveries d ON d.outbox_id = o.id
           WHERE o.kind = 'weekly.letter' AND o.recipient_id = l.sponsor_id AND o.idempotency_key LIKE 'weekly.letter:' || l.sponsor_id || ':' || l.student_id || ':%') AS "lastSentAt"
    FROM sponsor_links l JOIN people sp ON sp.id = l.sponsor_id JOIN people st ON st.id = l.student_id
   WHERE sp.school_id = :school AND st.school_id = :school AND sp.active AND st.active`;

export const LETTER_LINKS_PAGE_SIZE = 50;

/**
 * One page of the school's links, by sponsor then student, optionally those whose sponsor's or
 * student's name holds a part: paged in SQL with the number that match from one count (two
 * queries, whatever the number of links).
 */
export async function letterLinksPage(
  schoolId: string,
  filter: { name?: string | undefined } = {},
  opts: { page?: number; pageSize?: number } = {},
): Promise<{ rows: LetterLink[]; total: number; page: number; pageSize: number }> {
  const pageSize = opts.pageSize ?? LETTER_LINKS_PAGE_SIZE;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const name = filter.name ? containsPattern(filter.name) : null;
  const matching = `AND (CAST(:name AS text) IS NULL OR sp.name ILIKE CAST(:name AS text) OR st.name ILIKE CAST(:name AS text))`;
  const replacements = { school: schoolId, name };
  const [rows, [count]] = await Promise.all([
    sequelize.query<LetterLink>(`${SELECT} ${matching} ORDER BY sp.name, st.name, l.sponsor_id, l.student_id LIMIT :limit OFFSET :offset`, {
      replacements: { ...replacements, limit: pageSize, offset: (page - 1) * pageSize },
      type: QueryTypes.SELECT,
    }),
    sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM sponsor_links l JOIN people sp ON sp.id = l.sponsor_id JOIN people st ON st.id = l.student_id
        WHERE sp.school_id = :school AND st.school_id = :school AND sp.active AND st.active ${matching}`,
      { replacements, type: QueryTypes.SELECT },
    ),
  ]);
  return { rows, total: count?.n ?? 0, page, pageSize };
}

/** One link of the school, or a 404 naming the field. */
export async function letterLink(schoolId: string, sponsorId: string, studentId: string, t?: Transaction): Promise<LetterLink> {
  const uuid = /^[0-9a-f-]{36}$/i;
  const [row] =
    uuid.test(sponsorId) && uuid.test(studentId)
      ? await sequelize.query<LetterLink>(`${SELECT} AND l.sponsor_id = :sp AND l.student_id = :st`, {
          replacements: { school: schoolId, sp: sponsorId, st: studentId },
          type: QueryTypes.SELECT,
          transaction: t,
        })
      : [];
  if (!row) throw new HttpError(404, "sponsorId: not a sponsor of that student at this school", "sponsorId");
  return row;
}
