import "server-only";
import { QueryTypes } from "sequelize";
import { addMonths, format, parseISO } from "date-fns";
import { sequelize } from "../../index";
import { standingKey, type SignerStanding } from "@/lib/records/watch-notes";

// The standings of many signers on many dates at once (the register's watch notes), from two
// queries whatever the number of signers and dates; the same rule as `signerStanding`.

interface Want {
  signer_id: string;
  course_id: string;
  signed_on: string;
}

const inForce = (r: { valid_from: string; valid_to: string | null }, d: string) =>
  r.valid_from <= d && (r.valid_to === null || d < r.valid_to);

export async function signerStandings(wants: Want[]): Promise<Map<string, SignerStanding>> {
  const out = new Map<string, SignerStanding>();
  const people = [...new Set(wants.map((w) => w.signer_id))];
  if (people.length === 0) return out;
  const courses = await sequelize.query<{ person_id: string; course_id: string; valid_from: string; valid_to: string | null }>(
    // valid_from may be '-infinity' (courses given before their history was kept): compared as text
    `SELECT person_id, course_id, CASE WHEN valid_from = '-infinity' THEN '0001-01-01' ELSE to_char(valid_from, 'YYYY-MM-DD') END AS valid_from,
            to_char(valid_to, 'YYYY-MM-DD') AS valid_to
       FROM instructor_courses WHERE person_id IN (:people)`,
    { replacements: { people }, type: QueryTypes.SELECT },
  );
  const quals = await sequelize.query<{
    person_id: string;
    issued_on: string;
    recency_on: string;
    recency_months: number;
    valid_from: string;
    valid_to: string | null;
  }>(
    `SELECT person_id, issued_on, recency_on, recency_months, valid_from, valid_to FROM instructor_qualifications WHERE person_id IN (:people)`,
    { replacements: { people }, type: QueryTypes.SELECT },
  );
  for (const w of wants) {
    const key = standingKey(w);
    if (out.has(key)) continue;
    const d = w.signed_on;
    const course = courses.some((c) => c.person_id === w.signer_id && c.course_id === w.course_id && inForce(c, d));
    const mine = quals.filter((q) => q.person_id === w.signer_id && inForce(q, d));
    const current = mine.some((q) => q.issued_on <= d && d < format(addMonths(parseISO(q.recency_on), q.recency_months), "yyyy-MM-dd"));
    out.set(key, { qualified: course && mine.length > 0, current });
  }
  return out;
}
