// Transfers in: the demo transfer-in student and their credit (db/seed/transfers.ts), by e-mail.
export const TRANSFERS_LOOKUPS: Record<string, { sql: string; params?: unknown[] }> = {
  transferStudent: { sql: `SELECT id FROM people WHERE lower(email) = lower($1)`, params: ["odile.ferreira@chalkwing.test"] },
  transferCredit: {
    sql: `SELECT c.id FROM transfer_credits c JOIN people p ON p.id = c.student_id WHERE lower(p.email) = lower($1) ORDER BY c.created_at LIMIT 1`,
    params: ["odile.ferreira@chalkwing.test"],
  },
  pastRetentionStudent: { sql: `SELECT id FROM people WHERE lower(email) = lower($1)`, params: ["casimir.wetherell@chalkwing.test"] },
};
