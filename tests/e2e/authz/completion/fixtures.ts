// End of training: the demo graduate (db/seed/completion.ts), by e-mail.
export const COMPLETION_LOOKUPS: Record<string, { sql: string; params?: unknown[] }> = {
  graduate: { sql: `SELECT id FROM people WHERE lower(email) = lower($1)`, params: ["ines.varga@chalkwing.test"] },
};
