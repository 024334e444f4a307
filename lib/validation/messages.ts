// Error messages a user would write, in one place.
// - `plainIssueMessage`: zod's error map for every issue a schema did not word itself ("must be at
//   most 200 characters", never "Too big: expected string to have <=200 characters"). Installed for
//   the whole process by `installUserWords()` (server: run-action and the API; browser: the providers).
// - `fieldLabel`: the words for a field key ("dueOn" → "Due date"); screens say "Due date: …" while
//   the API's JSON still names the key in `field`.
// Pure module: no I/O, safe in the browser.
import { z } from "zod";

/** Field keys as people call them. Keys not listed are spelled out ("writtenScorePercent" → "Written score percent"). */
export const FIELD_LABELS: Record<string, string> = {
  dueOn: "Due date",
  writtenScorePercent: "Written score",
  durationMinutes: "Duration",
  occurredAt: "Date and time",
  startsAt: "Start",
  endsAt: "End",
  startDate: "Start date",
  startTime: "Start time",
  endTime: "End time",
  date: "Date",
  time: "Time",
  sessionId: "Session",
  studentId: "Student",
  studentIds: "Students",
  cohortId: "Cohort",
  courseId: "Course",
  briefingId: "Briefing",
  demoId: "Demo",
  instructorId: "Instructor",
  syllabusItemIds: "Syllabus items",
  itemIds: "Syllabus items",
  itemCodes: "Syllabus items",
  questionText: "Question",
  answerText: "Answer",
  expectedAnswer: "Expected answer",
  lateMinutes: "Minutes late",
  earlyMinutes: "Minutes left early",
  reason: "Reason",
  overrideReason: "Reason for the exception",
  remarks: "Remarks",
  note: "Note",
  name: "Name",
  email: "E-mail",
  password: "Password",
  title: "Title",
  objective: "Objective",
  room: "Room",
  roomId: "Room",
  capacity: "Seats",
  examiner: "Examiner",
  maxMassKg: "Maximum mass",
  massKg: "Mass (kg)",
  altitudeFt: "Altitude (ft)",
  speedKt: "Speed (kt EAS)",
  heightFt: "Height (ft)",
  onDate: "Move date",
  stages: "Stages",
  elements: "Lesson elements",
  minutes: "Minutes",
  emptyMassKg: "Empty mass",
  idempotencyKey: "Form",
  form: "Form",
};

/** "writtenScorePercent" → "Written score percent"; "starts_at" → "Starts at". */
export function spellOutKey(key: string): string {
  const spaced = key
    .replace(/([a-z0-9])([A-Z])/g, "$1 $2")
    .replace(/[_.-]+/g, " ")
    .trim()
    .toLowerCase();
  return spaced.charAt(0).toUpperCase() + spaced.slice(1);
}

/**
 * The words for a field path: "dueOn" → "Due date"; "questions.0.questionText" → "Question (line 1)";
 * "lines.2.status" → "Status (line 3)".
 */
export function fieldLabel(path: string | readonly PropertyKey[]): string {
  const parts = (typeof path === "string" ? path.split(".") : path.map(String)).filter((p) => p !== "");
  if (parts.length === 0) return "Form";
  const named = [...parts].reverse().find((p) => !/^\d+$/.test(p)) ?? "form";
  const index = [...parts].reverse().find((p) => /^\d+$/.test(p));
  const label = FIELD_LABELS[named] ?? spellOutKey(named);
  return index !== undefined ? `${label} (line ${Number(index) + 1})` : label;
}

/** "dueOn: must be a real date" → "Due date: must be a real date" (a message without the key is left alone). */
export function userMessage(message: string, field?: string | null): string {
  if (field) {
    const prefix = `${field}: `;
    return message.startsWith(prefix) ? `${fieldLabel(field)}: ${message.slice(prefix.length)}` : message;
  }
  // a message that starts with a bare key ("dueOn: …", "questions.0.text: …") gets the key's words
  const m = /^([a-z][A-Za-z0-9]*(?:\.[A-Za-z0-9]+)*): /.exec(message);
  return m ? `${fieldLabel(m[1]!)}: ${message.slice(m[0].length)}` : message;
}

/**
 * A failure on one row of a list ("lines.2.status") told with the row's own name:
 * "Ada Quill: Status: choose attended, late, left early or absent". Other failures keep their message.
 */
export function rowMessage(
  failure: { message: string; field?: string; fieldErrors?: Record<string, string[]> },
  rowName: (index: number) => string | undefined,
): string {
  const m = failure.field ? /^(.*?)\.(\d+)\.(.+)$/.exec(failure.field) : null;
  const name = m ? rowName(Number(m[2])) : undefined;
  if (!m || !name) return failure.message;
  const text = failure.fieldErrors?.[failure.field!]?.[0] ?? failure.message;
  return `${name}: ${fieldLabel(m[3]!)}: ${text}`;
}

/** The text a screen shows for an API error body `{ message, field? }`. */
export function apiErrorText(error: { message?: string; field?: string } | null | undefined, fallback: string): string {
  return error?.message ? userMessage(error.message, error.field) : fallback;
}

const plural = (n: number | bigint, one: string, many = `${one}s`) => `${n} ${Number(n) === 1 ? one : many}`;

const FORMATS: Record<string, string> = {
  email: "must be an e-mail address",
  url: "must be a web address",
  uuid: "is not a valid reference",
  guid: "is not a valid reference",
  date: "must be a real date (YYYY-MM-DD)",
  datetime: "must be a real date and time",
  time: "must be a time (HH:MM)",
  regex: "is not in the expected form",
};

/** zod's error map: plain English per issue kind, used only where a schema gave no message of its own. */
export function plainIssueMessage(issue: z.core.$ZodRawIssue): string | undefined {
  switch (issue.code) {
    case "invalid_type":
      if (issue.input === undefined || issue.input === null || issue.input === "") return "is required";
      if (issue.expected === "int" && typeof issue.input === "number") return "must be a whole number";
      if (issue.expected === "number" || issue.expected === "int") return "must be a number";
      if (issue.expected === "date") return "must be a real date";
      if (issue.expected === "boolean") return "must be yes or no";
      if (issue.expected === "array") return "must be a list";
      if (issue.expected === "string") return "must be text";
      return "is not valid";
    case "too_small": {
      const n = issue.minimum;
      const exclusive = issue.inclusive === false;
      if (issue.origin === "string") return Number(n) <= 1 ? "must not be empty" : `must be at least ${plural(n, "character")}`;
      if (issue.origin === "array" || issue.origin === "set") return Number(n) <= 1 ? "choose at least one" : `choose at least ${n}`;
      if (issue.origin === "date") return "is too early";
      return exclusive ? `must be more than ${n}` : `must be at least ${n}`;
    }
    case "too_big": {
      const n = issue.maximum;
      const exclusive = issue.inclusive === false;
      if (issue.origin === "string") return `must be at most ${plural(n, "character")}`;
      if (issue.origin === "array" || issue.origin === "set") return `at most ${n} may be chosen`;
      if (issue.origin === "date") return "is too late";
      return exclusive ? `must be less than ${n}` : `must be at most ${n}`;
    }
    case "invalid_format":
      return FORMATS[issue.format] ?? "is not in the expected form";
    case "not_multiple_of":
      return issue.divisor === 1 ? "must be a whole number" : `must be a multiple of ${issue.divisor}`;
    case "invalid_value":
      return issue.values.length <= 6 ? `must be one of: ${issue.values.map(String).join(", ")}` : "is not one of the choices";
    case "unrecognized_keys":
      return issue.keys.length === 1 ? `unknown field ${issue.keys[0]}` : `unknown fields ${issue.keys.join(", ")}`;
    case "invalid_union":
    case "invalid_key":
    case "invalid_element":
      return "is not valid";
    default:
      return undefined; // custom issues carry our own words
  }
}

let installed = false;
/** Makes `plainIssueMessage` zod's error map for this process or page (idempotent). */
export function installUserWords(): void {
  if (installed) return;
  z.config({ customError: plainIssueMessage });
  installed = true;
}
