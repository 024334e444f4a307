import "server-only";
import type { CurrentUser } from "@/lib/auth/session";
import { dateInZone, formatDay } from "@/lib/time";
import { standingKey, watchNoteKey, watchNotes, type WatchNote, type WatchNoteReview } from "@/lib/records/watch-notes";
import { cachedSummary } from "../shared/summary-cache";
import { OUTCOME_LABEL } from "@/lib/records/outcome";
import { watchNoteReviews } from "./watch-note-reviews";
import { getSchool } from "../shared/school";
import { registerFacts, registerRowFacts, type RegisterFacts } from "./register-facts";
import { registerRowCount, registerRowRefs, type RegisterRowRef } from "./register-page";
import { signerStandings } from "./signer-standings";

// The Sign-off register: sign-offs and stage checks as rows, each with its watch notes
// (the rules are in lib/records/watch-notes.ts), filtered, newest first and paged in SQL; the
// watch-note facts are read only for the rows of the page and for the school's latest records.

/** Rows on one page of the register. */
export const REGISTER_PAGE_SIZE = 50;
/** The recent watch notes come from this many latest sign-offs, stage checks and oral checks. */
export const WATCH_NOTE_WINDOW = 500;

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
function signOffBasis(s: RegisterFacts["signOffs"][number], tz: string): string {
  const outcomes = s.item_question_outcomes ?? [];
  const meets = s.item_meets ?? (outcomes.length > 0 && outcomes.every((o) => o === "solid"));
  const asked = outcomes.length ? ` (${outcomes.map((o) => OUTCOME_LABEL[o]).join(", ")})` : "";
  return `Oral check of ${formatDay(s.check_at, tz)}, ${s.item_code}: ${meets ? "meets the standard" : "Not yet"}${asked}, level ${s.check_level}`;
}

type Facts = Omit<RegisterFacts, "oralChecks"> & { oralChecks?: RegisterFacts["oralChecks"] };
type School = Awaited<ReturnType<typeof getSchool>>;

/** The watch notes the facts raise (the rules of lib/records/watch-notes.ts). */
async function notesOf(school: School, facts: Facts): Promise<WatchNote[]> {
  const standings = await signerStandings(facts.signOffs);
  return watchNotes({
    timeZone: school.timeZone,
    lateEntryDays: school.settings.lateEntryDays,
    signOffs: facts.signOffs,
    stageChecks: facts.stageChecks,
    oralChecks: facts.oralChecks ?? [],
    missedSessions: facts.missedSessions,
    standingOf: (s) => standings.get(standingKey(s))!,
  });
}

/** The register's rows for these sign-offs and stage checks, in the order of `refs`, each with its own watch notes. */
async function rowsOf(school: School, refs: RegisterRowRef[]): Promise<RegisterRow[]> {
  const tz = school.timeZone;
  const facts = await registerRowFacts(
    school.id,
    refs.filter((r) => r.kind === "sign_off").map((r) => r.id),
    refs.filter((r) => r.kind === "stage_check").map((r) => r.id),
  );
  const notesByRecord = new Map<string, WatchNote[]>();
  for (const n of await notesOf(school, facts)) notesByRecord.set(n.recordId, [...(notesByRecord.get(n.recordId) ?? []), n]);
  const notesFor = (id: string) => notesByRecord.get(id) ?? [];
  const byId = new Map<string, RegisterRow>();
  for (const s of facts.signOffs)
    byId.set(s.id, {
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
    });
  for (const c of facts.stageChecks)
    byId.set(c.id, {
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
    });
  return refs.map((r) => byId.get(r.id)).filter((r): r is RegisterRow => r !== undefined);
}

/**
 * The school's recent watch notes, newest first, with their reviews: the notes raised by the
 * latest WATCH_NOTE_WINDOW sign-offs, stage checks and oral checks (a bounded read, whatever the
 * size of the school). `studentId` restricts them to one student (access checked by the caller).
 */
export async function recentWatchNotes(user: Pick<CurrentUser, "schoolId">, opts: { studentId?: string } = {}): Promise<WatchNote[]> {
  if (opts.studentId) return computeWatchNotes(user.schoolId, opts.studentId);
  // the school's notes are kept while its records are unchanged (cachedSummary, migration 0650)
  return cachedSummary(user.schoolId, "watch-notes", () => computeWatchNotes(user.schoolId, null), reviveWatchNotes);
}

function reviveWatchNotes(stored: unknown): WatchNote[] {
  return (
    stored as (Omit<WatchNote, "at" | "reviews"> & {
      at: string;
      reviews?: (Omit<WatchNoteReview, "reviewedAt"> & { reviewedAt: string })[];
    })[]
  ).map((n) => ({ ...n, at: new Date(n.at), reviews: n.reviews?.map((r) => ({ ...r, reviewedAt: new Date(r.reviewedAt) })) }));
}

async function computeWatchNotes(schoolId: string, studentId: string | null): Promise<WatchNote[]> {
  const school = await getSchool(schoolId);
  const facts = await registerFacts(schoolId, studentId, WATCH_NOTE_WINDOW);
  const notes = await notesOf(school, facts);
  const reviews = await watchNoteReviews(schoolId);
  for (const n of notes) n.reviews = reviews.get(watchNoteKey(n)) ?? [];
  notes.sort((a, b) => b.at.getTime() - a.at.getTime());
  return notes;
}

/**
 * One page of the register (filtered, sorted and paged in SQL; `pageSize` null: every matching
 * row) with the number of matching rows, and the school's recent watch notes. `studentId`
 * restricts both to one student: callers pass it only after checking their access to that student
 * (the training record), and then every row is read unless a page size is given.
 */
export async function signOffRegister(
  user: Pick<CurrentUser, "schoolId">,
  filter: RegisterFilter = {},
  opts: { studentId?: string; page?: number; pageSize?: number | null } = {},
): Promise<{ rows: RegisterRow[]; notes: WatchNote[]; total: number; page: number; pageSize: number | null }> {
  const school = await getSchool(user.schoolId);
  const studentId = opts.studentId ?? null;
  const pageSize = opts.pageSize !== undefined ? opts.pageSize : studentId ? null : REGISTER_PAGE_SIZE;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const count = () => registerRowCount(school.id, school.timeZone, filter, studentId);
  // the count reads every matching row: without dates (the register as first opened, or filtered by
  // instructor, cohort or stage) it is kept while the records are unchanged (cachedSummary)
  const countKey = `register-count:${filter.instructorId ?? ""}:${filter.cohortId ?? ""}:${filter.stageId ?? ""}`;
  const [refs, counted] = await Promise.all([
    registerRowRefs(school.id, school.timeZone, filter, studentId, {
      limit: pageSize,
      offset: pageSize === null ? 0 : (page - 1) * pageSize,
    }),
    pageSize === null ? null : filter.from || filter.to || studentId ? count() : cachedSummary(school.id, countKey, count, Number),
  ]);
  const total = counted ?? refs.length;
  const rows = await rowsOf(school, refs);
  const notes = await recentWatchNotes(user, opts.studentId ? { studentId: opts.studentId } : {});
  return { rows, notes, total, page, pageSize };
}

/** Every matching row of the register in its order, `batch` rows at a time (the CSV export). */
export async function* registerRowBatches(
  user: Pick<CurrentUser, "schoolId">,
  filter: RegisterFilter = {},
  batch = 500,
): AsyncGenerator<RegisterRow[]> {
  const school = await getSchool(user.schoolId);
  let after: RegisterRowRef | undefined;
  for (;;) {
    const refs = await registerRowRefs(school.id, school.timeZone, filter, null, { limit: batch, after });
    if (refs.length === 0) return;
    yield await rowsOf(school, refs);
    if (refs.length < batch) return;
    after = refs[refs.length - 1];
  }
}
