import { HttpError } from "@/lib/http/errors";
import type { AttendanceLine, AttendanceStatusName } from "./schema";

// The ground-time crediting rule: pure, no I/O. The Ground log's writes call it; nothing else decides credit.

/** The statuses that count as an absence (no credit, a make-up item per missed syllabus item). */
export const ABSENT_STATUSES: readonly AttendanceStatusName[] = ["absent", "absent_excused"];

export function isAbsence(status: AttendanceStatusName): boolean {
  return ABSENT_STATUSES.includes(status);
}

/**
 * Minutes credited for one student: the session's length less late arrival and early departure
 * for those present, none for an absence. An explicit figure may lower it, never raise it past
 * the session's length, and must be zero for an absence.
 */
export function creditFor(
  sessionMinutes: number,
  line: Pick<AttendanceLine, "status" | "lateMinutes" | "earlyMinutes" | "creditedMinutes">,
): { late: number; early: number; credited: number } {
  const absent = isAbsence(line.status);
  const late = line.status === "late" ? line.lateMinutes : 0;
  const early = line.status === "left_early" ? line.earlyMinutes : 0;
  if (line.status === "late" && late <= 0) throw new HttpError(400, "lateMinutes: say how many minutes late", "lateMinutes");
  if (line.status === "left_early" && early <= 0)
    throw new HttpError(400, "earlyMinutes: say how many minutes early the student left", "earlyMinutes");
  if (late + early >= sessionMinutes && !absent)
    throw new HttpError(
      400,
      "lateMinutes: late arrival and early departure use up the whole session; record an absence instead",
      "lateMinutes",
    );
  const computed = absent ? 0 : sessionMinutes - late - early;
  const explicit = line.creditedMinutes === undefined || line.creditedMinutes === "" ? null : line.creditedMinutes;
  if (explicit === null) return { late, early, credited: computed };
  if (absent && explicit !== 0) throw new HttpError(400, "creditedMinutes: an absence earns no minutes", "creditedMinutes");
  if (explicit > computed) throw new HttpError(400, `creditedMinutes: at most ${computed} for this session and status`, "creditedMinutes");
  return { late, early, credited: explicit };
}
