import { differenceInCalendarDays } from "date-fns";
import { dateInZone, formatDay } from "@/lib/time";

// The watch-note rules of the Sign-off register (pure): which notes a sign-off, a stage check
// or an oral check raises, and their labels. The data layer reads the facts; this decides.

export const WATCH_NOTE_KINDS = [
  "signed_before_check",
  "signer_not_current",
  "examiner_was_lead",
  "missed_session",
  "late_entry",
  "repeated_not_yet",
  "amended",
  "withdrawn",
] as const;
export type WatchNoteKind = (typeof WATCH_NOTE_KINDS)[number];

export const WATCH_NOTE_LABEL: Record<WatchNoteKind, string> = {
  signed_before_check: "Signed before its check",
  signer_not_current: "Signer not qualified or not current",
  examiner_was_lead: "Examiner was the lead instructor",
  missed_session: "Covering session missed, no make-up",
  late_entry: "Entered late",
  repeated_not_yet: "Repeated Not yet",
  amended: "Amended",
  withdrawn: "Withdrawn",
};

export interface WatchNote {
  kind: WatchNoteKind;
  label: string;
  detail: string;
  recordType: "sign_off" | "oral_check" | "stage_check";
  recordId: string;
  studentId: string;
  studentName: string;
  itemCode: string | null;
  at: Date;
  /** the chief's reviews of this note, oldest first (appended, never removed) */
  reviews?: WatchNoteReview[];
}

export interface WatchNoteReview {
  remark: string;
  reviewerName: string;
  reviewedAt: Date;
}

/** A derived note's stable name: its record, kind and item. */
export function watchNoteKey(n: Pick<WatchNote, "recordType" | "recordId" | "kind"> & { itemCode?: string | null | undefined }): string {
  return `${n.recordType}:${n.recordId}:${n.kind}:${n.itemCode ?? ""}`;
}

/** What the rules need to know about a sign-off. */
export interface SignOffFacts {
  id: string;
  student_id: string;
  student_name: string;
  item_id: string;
  item_code: string;
  course_id: string;
  signer_id: string;
  signer_name: string;
  /** the school-calendar date signed for */
  signed_on: string;
  signed_at: Date;
  /** when the basis oral check happened */
  check_at: Date;
  amends_id: string | null;
  amend_reason: string | null;
  withdraw_reason: string | null;
}

/** What the rules need to know about a stage check. */
export interface StageCheckFacts {
  id: string;
  student_id: string;
  student_name: string;
  examiner_id: string;
  examiner_name: string;
  lead_instructor_id: string | null;
  override_reason: string | null;
  occurred_at: Date;
  recorded_at: Date;
}

/** What the rules need to know about an oral check (in order of occurrence). */
export interface OralCheckFacts {
  id: string;
  student_id: string;
  student_name: string;
  occurred_at: Date;
  recorded_at: Date;
  amends_id: string | null;
  amend_reason: string | null;
  withdraw_reason: string | null;
  withdrawn_at: Date | null;
  /** codes of the items with a Not yet answer */
  not_yet_items: string[] | null;
}

export interface SignerStanding {
  qualified: boolean;
  current: boolean;
}

export interface WatchNoteFacts {
  timeZone: string;
  /** settings.lateEntryDays: entries made more days than this after the fact are late */
  lateEntryDays: number;
  signOffs: SignOffFacts[];
  stageChecks: StageCheckFacts[];
  oralChecks: OralCheckFacts[];
  /** `${studentId}:${itemId}` of covering sessions missed without a completed make-up */
  missedSessions: Set<string>;
  /** the signer's standing for the sign-off's course on the date signed for */
  standingOf: (signOff: SignOffFacts) => SignerStanding;
}

/** The signer standings a set of sign-offs needs, one key per signer, course and date. */
export function standingKey(s: Pick<SignOffFacts, "signer_id" | "course_id" | "signed_on">): string {
  return `${s.signer_id}:${s.course_id}:${s.signed_on}`;
}

/** Every watch note the facts raise (unsorted). */
export function watchNotes(f: WatchNoteFacts): WatchNote[] {
  const notes: WatchNote[] = [];
  const lateDays = f.lateEntryDays;
  const note = (n: Omit<WatchNote, "label">) => notes.push({ ...n, label: WATCH_NOTE_LABEL[n.kind] });

  for (const s of f.signOffs) {
    const base = {
      recordType: "sign_off" as const,
      recordId: s.id,
      studentId: s.student_id,
      studentName: s.student_name,
      itemCode: s.item_code,
      at: s.signed_at,
    };
    const checkDate = dateInZone(s.check_at, f.timeZone);
    if (s.signed_on < checkDate)
      note({
        ...base,
        kind: "signed_before_check",
        detail: `signed for ${formatDay(s.signed_on)}, its check is of ${formatDay(checkDate)}`,
      });
    const st = f.standingOf(s);
    if (!st.qualified || !st.current)
      note({
        ...base,
        kind: "signer_not_current",
        detail: `${s.signer_name} was ${!st.qualified ? "not qualified for the course" : "not current"} on ${formatDay(s.signed_on)}`,
      });
    if (f.missedSessions.has(`${s.student_id}:${s.item_id}`))
      note({
        ...base,
        kind: "missed_session",
        detail: `${s.student_name} missed a session covering ${s.item_code} and has no completed make-up`,
      });
    const lag = differenceInCalendarDays(s.signed_at, new Date(`${s.signed_on}T12:00:00Z`));
    if (lag > lateDays) note({ ...base, kind: "late_entry", detail: `entered ${lag} days after the date signed for (limit ${lateDays})` });
    if (s.amends_id) note({ ...base, kind: "amended", detail: `amends an earlier sign-off: ${s.amend_reason}` });
    if (s.withdraw_reason) note({ ...base, kind: "withdrawn", detail: `withdrawn: ${s.withdraw_reason}` });
  }
  for (const c of f.stageChecks) {
    const base = {
      recordType: "stage_check" as const,
      recordId: c.id,
      studentId: c.student_id,
      studentName: c.student_name,
      itemCode: null,
      at: c.recorded_at,
    };
    if (c.lead_instructor_id && c.lead_instructor_id === c.examiner_id)
      note({
        ...base,
        kind: "examiner_was_lead",
        detail: `${c.examiner_name} examined their own student: ${c.override_reason ?? "no reason"}`,
      });
    const lag = differenceInCalendarDays(c.recorded_at, c.occurred_at);
    if (lag > lateDays) note({ ...base, kind: "late_entry", detail: `entered ${lag} days after the stage check (limit ${lateDays})` });
  }
  const notYetCount = new Map<string, { n: number; last: OralCheckFacts }>();
  for (const c of f.oralChecks) {
    const base = {
      recordType: "oral_check" as const,
      recordId: c.id,
      studentId: c.student_id,
      studentName: c.student_name,
      itemCode: null,
      at: c.recorded_at,
    };
    const lag = differenceInCalendarDays(c.recorded_at, c.occurred_at);
    if (lag > lateDays)
      note({ ...base, kind: "late_entry", detail: `oral check entered ${lag} days after it happened (limit ${lateDays})` });
    if (c.amends_id) note({ ...base, kind: "amended", detail: `oral check amended: ${c.amend_reason}` });
    if (c.withdraw_reason)
      note({ ...base, kind: "withdrawn", detail: `oral check withdrawn: ${c.withdraw_reason}`, at: c.withdrawn_at ?? c.recorded_at });
    if (c.withdraw_reason) continue;
    for (const code of c.not_yet_items ?? []) {
      const k = `${c.student_id}:${code}`;
      const e = notYetCount.get(k) ?? { n: 0, last: c };
      notYetCount.set(k, { n: e.n + 1, last: c });
    }
  }
  for (const [k, v] of notYetCount) {
    if (v.n < 2) continue;
    const code = k.split(":")[1]!;
    note({
      recordType: "oral_check",
      recordId: v.last.id,
      studentId: v.last.student_id,
      studentName: v.last.student_name,
      itemCode: code,
      at: v.last.recorded_at,
      kind: "repeated_not_yet",
      detail: `${v.n} oral checks with Not yet on ${code}`,
    });
  }
  return notes;
}
