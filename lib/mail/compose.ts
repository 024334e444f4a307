import { env } from "@/lib/env";
import {
  action,
  bullets,
  dateLong,
  facts,
  greet,
  oneLine,
  para,
  render,
  timeOnly,
  whenLong,
  type ComposedMail,
  type MailSchool,
} from "./layout";

export type { ComposedMail, MailSchool } from "./layout";

/**
 * The data each kind of mail needs. Callers in other areas use the first six (written
 * into the outbox in the transaction of their change); the worker itself produces the
 * reminders. The Weekly letter has its own composer (`lib/mail/letter.ts`).
 */
export interface MailDataByKind {
  invitation: { name: string; setPasswordUrl: string; expiresAt: Date };
  "session.rescheduled": {
    name: string;
    briefingTitle: string;
    previousStartsAt: Date;
    startsAt: Date;
    endsAt: Date;
    room: string;
    instructorName: string;
  };
  "session.cancelled": { name: string; briefingTitle: string; startsAt: Date; room: string; reason: string };
  "assignment.new": { name: string; title: string; assignmentKind: "briefing" | "demo"; dueOn: string; path: string };
  "record.signed": { name: string; itemCode: string; itemTitle: string; signerName: string; signedOn: string };
  "check.notyet": { name: string; itemCodes: string[]; checkedOn: string };
  /** Produced by the mail worker: the set time before a session. */
  "session.reminder": { name: string; briefingTitle: string; startsAt: Date; endsAt: Date; room: string; instructorName: string };
  /** Produced by the mail worker: the day after an assignment's due date, while not done. */
  "assignment.overdue": { name: string; title: string; assignmentKind: "briefing" | "demo"; dueOn: string; path: string };
}

export type MailKind = keyof MailDataByKind;
export const MAIL_KINDS = [
  "invitation",
  "session.rescheduled",
  "session.cancelled",
  "assignment.new",
  "record.signed",
  "check.notyet",
  "session.reminder",
  "assignment.overdue",
] as const satisfies readonly MailKind[];

/** An absolute link into the app from a path such as "/briefings/123". */
export function appLink(path: string): string {
  if (!path.startsWith("/") || path.startsWith("//")) throw new Error("path: must start with a single /");
  return new URL(path, env().NEXTAUTH_URL).toString();
}

function kindLabel(k: "briefing" | "demo"): string {
  return k === "briefing" ? "Briefing" : "Demo";
}

type Composer<K extends MailKind> = (data: MailDataByKind[K], school: MailSchool) => ComposedMail;

const composers: { [K in MailKind]: Composer<K> } = {
  invitation: (d, s) => {
    const title = `Your Chalkwing account at ${s.name}`;
    return {
      subject: title,
      ...render({
        school: s,
        title,
        greeting: greet(d.name),
        blocks: [
          para(`${s.name} has made you an account in Chalkwing, where the ground school keeps your timetable, briefings and progress.`),
          para("Choose your password with the link below. The link works once."),
          action("Choose your password", d.setPasswordUrl),
          facts([["Link expires", whenLong(d.expiresAt, s.timeZone)]]),
          para("If you were not expecting this, you can ignore this message; no account is used until a password is chosen."),
        ],
      }),
    };
  },

  "session.rescheduled": (d, s) => {
    const title = `Moved: ${d.briefingTitle}`;
    return {
      subject: `Session moved: ${d.briefingTitle}, now ${whenLong(d.startsAt, s.timeZone)}`,
      ...render({
        school: s,
        title,
        greeting: greet(d.name),
        blocks: [
          para(`The session "${d.briefingTitle}" has a new time.`),
          facts([
            ["New time", `${whenLong(d.startsAt, s.timeZone)} to ${timeOnly(d.endsAt, s.timeZone)}`],
            ["Was", whenLong(d.previousStartsAt, s.timeZone)],
            ["Room", d.room],
            ["Instructor", d.instructorName],
          ]),
          para("Your Timetable in Chalkwing shows the change too."),
        ],
      }),
    };
  },

  "session.cancelled": (d, s) => {
    const title = `Cancelled: ${d.briefingTitle}`;
    const rows: [string, string][] = [
      ["Was planned for", whenLong(d.startsAt, s.timeZone)],
      ["Room", d.room],
    ];
    if (d.reason.trim()) rows.push(["Reason", d.reason]);
    return {
      subject: `Session cancelled: ${d.briefingTitle}, ${whenLong(d.startsAt, s.timeZone)}`,
      ...render({
        school: s,
        title,
        greeting: greet(d.name),
        blocks: [
          para(`The session "${d.briefingTitle}" will not take place.`),
          facts(rows),
          para("If this session covers an item you still need, a make-up will show on your Today page."),
        ],
      }),
    };
  },

  "assignment.new": (d, s) => {
    const title = `New ${kindLabel(d.assignmentKind).toLowerCase()} to review: ${d.title}`;
    return {
      subject: `${kindLabel(d.assignmentKind)} assigned: ${d.title}, due ${dateLong(d.dueOn)}`,
      ...render({
        school: s,
        title,
        greeting: greet(d.name),
        blocks: [
          para(`You have been assigned the ${d.assignmentKind} "${d.title}".`),
          facts([["Due", dateLong(d.dueOn)]]),
          action(`Open the ${d.assignmentKind}`, appLink(d.path)),
        ],
      }),
    };
  },

  "record.signed": (d, s) => {
    const title = `Signed off: ${d.itemCode} ${d.itemTitle}`;
    return {
      subject: title,
      ...render({
        school: s,
        title,
        greeting: greet(d.name),
        blocks: [
          para(`Well done: syllabus item ${d.itemCode} "${d.itemTitle}" is signed off.`),
          facts([
            ["Signed by", d.signerName],
            ["On", dateLong(d.signedOn)],
          ]),
          para("Your Progress map in Chalkwing shows the item as complete."),
        ],
      }),
    };
  },

  "check.notyet": (d, s) => {
    const title = "Oral check: items to revisit";
    return {
      subject: `Oral check of ${dateLong(d.checkedOn)}: ${d.itemCodes.length === 1 ? "one item" : `${d.itemCodes.length} items`} to revisit`,
      ...render({
        school: s,
        title,
        greeting: greet(d.name),
        blocks: [
          para(`Your oral check on ${dateLong(d.checkedOn)} had answers marked Not yet for these syllabus items:`),
          bullets(d.itemCodes),
          para("Your instructor's debrief in Chalkwing says what to look at again. A further check will be arranged."),
        ],
      }),
    };
  },

  "session.reminder": (d, s) => {
    const title = `Reminder: ${d.briefingTitle}`;
    return {
      subject: `Reminder: ${d.briefingTitle}, ${whenLong(d.startsAt, s.timeZone)}`,
      ...render({
        school: s,
        title,
        greeting: greet(d.name),
        blocks: [
          para(`You are on the list for "${d.briefingTitle}".`),
          facts([
            ["When", `${whenLong(d.startsAt, s.timeZone)} to ${timeOnly(d.endsAt, s.timeZone)}`],
            ["Room", d.room],
            ["Instructor", d.instructorName],
          ]),
          para("Reading the briefing beforehand in Chalkwing makes the session go further."),
        ],
      }),
    };
  },

  "assignment.overdue": (d, s) => {
    const title = `Overdue: ${d.title}`;
    return {
      subject: `Overdue ${d.assignmentKind}: ${d.title} (was due ${dateLong(d.dueOn)})`,
      ...render({
        school: s,
        title,
        greeting: greet(d.name),
        blocks: [
          para(`The ${d.assignmentKind} "${d.title}" was due on ${dateLong(d.dueOn)} and is not marked done yet.`),
          action(`Open the ${d.assignmentKind}`, appLink(d.path)),
          para("If you have already reviewed it, mark it done in Chalkwing so your instructor sees it."),
        ],
      }),
    };
  },
};

/**
 * Composes one mail: subject, plain text and HTML (our own table layout, inline styles,
 * every user string escaped), times in the school's time zone. Never includes internal
 * remarks: only the fields named in `MailDataByKind` reach the mail.
 */
export function composeMail<K extends MailKind>(kind: K, data: MailDataByKind[K], school: MailSchool): ComposedMail {
  const composer = composers[kind] as Composer<K> | undefined;
  if (!composer) throw new Error(`kind: unknown mail kind ${String(kind)}`);
  const mail = composer(data, school);
  return { ...mail, subject: oneLine(mail.subject) };
}
