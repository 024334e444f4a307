// The one place where stored codes become words: screens, mail, CSV and PDF all read these maps
// (never print a code such as "absent_excused" or "session.cancelled" as it is stored).
// Words come from the README's Vocabulary. Pure module: no I/O, safe in the browser.

export type AttendanceCode = "attended" | "late" | "left_early" | "absent_excused" | "absent";
export const ATTENDANCE_WORDS: Record<AttendanceCode, string> = {
  attended: "Attended",
  late: "Late",
  left_early: "Left early",
  absent_excused: "Absent, excused",
  absent: "Absent",
};

/** A syllabus item's place on the Progress map. */
export type ItemStatusCode = "not_started" | "taught" | "checked" | "signed" | "stage_passed";
export const ITEM_STATUS_WORDS: Record<ItemStatusCode, string> = {
  not_started: "Not started",
  taught: "Taught",
  checked: "Checked",
  signed: "Signed off",
  stage_passed: "Stage passed",
};

export type QuestionOutcomeCode = "solid" | "shaky" | "not_yet";
export const QUESTION_OUTCOME_WORDS: Record<QuestionOutcomeCode, string> = { solid: "Solid", shaky: "Shaky", not_yet: "Not yet" };

export type CheckOutcomeCode = "meets" | "not_yet";
export const CHECK_OUTCOME_WORDS: Record<CheckOutcomeCode, string> = { meets: "Meets the standard", not_yet: "Not yet" };

export type MakeupStateCode = "open" | "scheduled" | "done" | "waived";
export const MAKEUP_STATE_WORDS: Record<MakeupStateCode, string> = { open: "Open", scheduled: "Scheduled", done: "Done", waived: "Waived" };

/** A record's standing under the retention rules (lib/retention/rules.ts). */
export type RetentionStateCode = "in_training" | "kept" | "held" | "due" | "archived";
export const RETENTION_STATE_WORDS: Record<RetentionStateCode, string> = {
  in_training: "In training",
  kept: "Kept",
  held: "On legal hold",
  due: "Ready to archive",
  archived: "Archived",
};

/** A sign-off's standing in the register. */
export type SignOffStateCode = "current" | "withdrawn" | "amended";
export const SIGN_OFF_STATE_WORDS: Record<SignOffStateCode, string> = { current: "Current", withdrawn: "Withdrawn", amended: "Amended" };

export type StageResultCode = "pass" | "fail";
export const STAGE_RESULT_WORDS: Record<StageResultCode, string> = { pass: "Passed", fail: "Not passed" };

export type MailStateCode = "queued" | "sent" | "failed" | "cancelled";
export const MAIL_STATE_WORDS: Record<MailStateCode, string> = { queued: "Queued", sent: "Sent", failed: "Failed", cancelled: "Cancelled" };

export const MAIL_KIND_WORDS: Record<string, string> = {
  invitation: "Invitation",
  "session.rescheduled": "Session moved",
  "session.cancelled": "Session cancelled",
  "session.reminder": "Session reminder",
  "assignment.new": "New assignment",
  "assignment.overdue": "Overdue assignment",
  "record.signed": "Sign-off",
  "check.notyet": "Items to revisit",
  "weekly.letter": "Weekly letter",
};

/** "absent_excused" → "Absent excused": the fallback for a code no map knows yet (never shown raw). */
export function codeToWords(code: string): string {
  const spaced = code.replace(/[_.-]+/g, " ").trim();
  return spaced.charAt(0).toUpperCase() + spaced.slice(1);
}

/** The word for a code from a map, or its spelled-out form when the map does not know it. */
export function words<K extends string>(map: Partial<Record<K, string>>, code: K | string): string {
  return (map as Record<string, string | undefined>)[code] ?? codeToWords(code);
}
