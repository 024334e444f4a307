import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { now } from "@/lib/clock";

// Summaries kept per school and key (migration 0650): an aggregate over every record of a school
// (the stages waiting for their check, the watch notes) is computed once and read again while no
// table of the school's records has been written since (records_version_seq has not moved) and for
// at most SUMMARY_FRESH_MS. Kept in PostgreSQL, so every app server shares it.

/** How long a kept summary may be shown at most, even when no write was seen since (see 0650). */
export const SUMMARY_FRESH_MS = 60_000;

/**
 * The summary kept under `key` for this school when it is current, else `compute()` (kept for the
 * next caller). `revive` turns the stored JSON back into the value (dates come back as strings).
 * Two queries when current, whatever the size of the school: the version and the kept row are one.
 */
export async function cachedSummary<T>(
  schoolId: string,
  key: string,
  compute: () => Promise<T>,
  revive: (stored: unknown) => T,
): Promise<T> {
  const at = now();
  const oldest = new Date(at.getTime() - SUMMARY_FRESH_MS);
  const [row] = await sequelize.query<{ version: string; payload: unknown }>(
    `SELECT v.last_value::text AS version, c.payload
       FROM records_version_seq v
       LEFT JOIN summary_cache c ON c.school_id = :schoolId AND c.key = :key AND c.version = v.last_value
                                AND c.computed_at > :oldest AND c.computed_at <= :at`,
    { replacements: { schoolId, key, at, oldest }, type: QueryTypes.SELECT },
  );
  if (row && row.payload !== null && row.payload !== undefined) return revive(row.payload);
  // the version read before computing: a write after this point moves the sequence past it
  const value = await compute();
  if (row) {
    try {
      await sequelize.query(
        `INSERT INTO summary_cache (school_id, key, version, computed_at, payload)
         VALUES (:schoolId, :key, :version, :at, CAST(:payload AS jsonb))
         ON CONFLICT (school_id, key) DO UPDATE
           SET version = EXCLUDED.version, computed_at = EXCLUDED.computed_at, payload = EXCLUDED.payload
         WHERE summary_cache.version <= EXCLUDED.version`,
        { replacements: { schoolId, key, version: row.version, at, payload: JSON.stringify(value) } },
      );
    } catch (e) {
      // keeping it is an optimisation: a read-only replica or a lost race still answers
      console.warn(`[summary-cache] could not keep ${key}: ${(e as Error).message}`);
    }
  }
  return value;
}

/** A stored date (an ISO string) back as a Date; null stays null. */
export function reviveDate(v: unknown): Date | null {
  return v === null || v === undefined ? null : new Date(v as string);
}
