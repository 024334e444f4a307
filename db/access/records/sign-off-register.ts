import "server-only";
import type { CurrentUser } from "@/lib/auth/session";
import { dateInZone } from "@/lib/time";
import { standingKey, watchNoteKey, watchNotes, type WatchNote } from "@/lib/records/watch-notes";
import { OUTCOME_LABEL } from "@/lib/records/outcome";
import { watchNoteReviews } from "./watch-note-reviews";
import { getSchool } from "../shared/school";
import { registerFacts } from "./register-facts";
import { signerStandings } from "./signer-standings";

// The Sign-off register: sign-offs and stage checks as rows, each with its watch notes
// (the rules are in lib/records/watch-notes.ts), filtered and newest first.

export { registerFilterOptions } from "./register-facts";
export type { WatchNote, WatchNoteKind } from "@/lib/records/watch-notes";

export interface RegisterRow {
  kind: "sign_off" | "stage_check";
  id: string;
  studentId: string;
  studentName: string;
  cohortId: string | null;
  cohortName: string | null;
  stageId: string;
  stageCode: string;
  itemCode: string | null;
  itemTitle: string | null;
  signerId: string;
  signerName: string;
  date: string;
  recordedAt: Date;
  basis: string;
  state: "current" | "withdrawn" | "amended" | "pass" | "fail";
  reason: string | null;
  signatureHash: string;
  notes: WatchNote[];
}

export interface RegisterFilter {
  instructorId?: string | undefined;
  cohortId?: string | undefined;
  stageId?: string | undefined;
  from?: string | undefined;
  to?: string | undefined;
}

/**
 * A sign-off's basis: the signed item's own result in its basis check (never the check's overall
 * outcome, which may be Not yet because of another item), with its questions' outcomes.
 */
function signOffBasis(s: Awaited<ReturnType<typeof registerFacts>>["signOffs"][number], tz: string): string {
  const outcomes = s.item_question_outcomes ?? [];
  const meets = s.item_meets ?? (outcomes.length > 0 && outcomes.every((o) => o === "solid"));
  const asked = outcomes.length ? ` (${outcomes.map((o) => OUTCOME_LABEL[o]).join(", ")})` : "";
  return `Oral check of ${dateInZone(s.check_at, tz)}, ${s.item_code}: ${meets ? "meets the standard" : "Not yet"}${asked}, level ${s.check_level}`;
}

/**
 * The register's rows (sign-offs and stage checks) and every watch note of the caller's school.
 * `studentId` restricts both to one student: callers pass it only after checking their access to
 * that student (the training record).
 */
export async function signOffRegister(
  user: Pick<CurrentUser, "schoolId">,
  filter: RegisterFilter = {},
  opts: { studentId?: string } = {},
): Promise<{ rows: RegisterRow[]; notes: WatchNote[] }> {
  const school = await getSchool(user.schoolId);
  const tz = school.timeZone;
  const facts = await registerFacts(user.schoolId, opts.studentId ?? null);
  const standings = await signerStandings(facts.signOffs);
  const notes = watchNotes({
    timeZone: tz,
    lateEntryDays: school.settings.lateEntryDays,
    signOffs: facts.signOffs,
    stageChecks: facts.stageChecks,
    oralChecks: facts.oralChecks,
    missedSessions: facts.missedSessions,
    standingOf: (s) => standings.get(standingKey(s))!,
  });
  const reviews = await watchNoteReviews(user.schoolId);
  for (const n of notes) n.reviews = reviews.get(watchNoteKey(n)) ?? [];

  const notesFor = (id: string) => notes.filter((n) => n.recordId === id);
  let rows: RegisterRow[] = [
    ...facts.signOffs.map((s): RegisterRow => ({
      kind: "sign_off",
      id: s.id,
      studentId: s.student_id,
      studentName: s.student_name,
      cohortId: s.cohort_id,
      cohortName: s.cohort_name,
      stageId: s.stage_id,
      stageCode: s.stage_code,
      itemCode: s.item_code,
      itemTitle: s.item_title,
      signerId: s.signer_id,
      signerName: s.signer_name,
      date: s.signed_on,
      recordedAt: s.signed_at,
      basis: signOffBasis(s, tz),
      state: s.withdraw_reason ? "withdrawn" : s.amended_by ? "amended" : "current",
      reason: s.withdraw_reason ?? s.amend_reason,
      signatureHash: s.signature_hash,
      notes: notesFor(s.id),
    })),
    ...facts.stageChecks.map((c): RegisterRow => ({
      kind: "stage_check",
      id: c.id,
      studentId: c.student_id,
      studentName: c.student_name,
      cohortId: c.cohort_id,
      cohortName: c.cohort_name,
      stageId: c.stage_id,
      stageCode: c.stage_code,
      itemCode: null,
      itemTitle: `Stage check ${c.stage_code} (attempt ${c.attempt})`,
      signerId: c.examiner_id,
      signerName: c.examiner_name,
      date: dateInZone(c.occurred_at, tz),
      recordedAt: c.recorded_at,
      basis: `Oral: ${c.oral_outcomes.map((o) => `${o.code ?? "?"} ${o.outcome === "solid" ? "Solid" : o.outcome === "shaky" ? "Shaky" : "Not yet"}`).join(", ") || "—"}; written ${c.written_score_percent === null ? "not set" : `${Number(c.written_score_percent)} % (pass mark ${Number(c.pass_mark_percent)} %)`}`,
      state: c.result,
      reason: c.override_reason,
      signatureHash: c.signature_hash,
      notes: notesFor(c.id),
    })),
  ];
  rows = rows.filter(
    (r) =>
      (!filter.instructorId || r.signerId === filter.instructorId) &&
      (!filter.cohortId || r.cohortId === filter.cohortId) &&
      (!filter.stageId || r.stageId === filter.stageId) &&
      (!filter.from || r.date >= filter.from) &&
      (!filter.to || r.date <= filter.to),
  );
  rows.sort((a, b) => b.date.localeCompare(a.date) || b.recordedAt.getTime() - a.recordedAt.getTime());
  notes.sort((a, b) => b.at.getTime() - a.at.getTime());
  return { rows, notes };
}
