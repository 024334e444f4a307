import { hoursLabel } from "@/lib/time";
import {
  COLOURS,
  bullets,
  dateLong,
  firstName,
  esc,
  facts,
  heading,
  oneLine,
  para,
  render,
  timeOnly,
  whenShort,
  type Block,
  type ComposedMail,
  type MailSchool,
} from "./layout";
import { ATTENDANCE_WORDS, CHECK_OUTCOME_WORDS } from "@/lib/labels";
import { assessWeek } from "./week-assessment";

export type AttendanceStatus = "attended" | "late" | "left_early" | "absent_excused" | "absent";

/** Words for the statuses: the one label map (lib/labels.ts). */
export const ATTENDANCE_LABEL: Record<AttendanceStatus, string> = ATTENDANCE_WORDS;

/**
 * What a Weekly letter may say. Each section is present only when the student shares it with
 * this sponsor (the producer leaves the others undefined and never reads their data).
 */
export interface WeeklyLetterData {
  sponsorName: string;
  studentName: string;
  /** Monday of the week, "yyyy-MM-dd" (names the letter in its subject) */
  weekStart: string;
  /** the days the letter covers: the seven before it was written and the seven after (lib/mail/letter-week.ts) */
  window?: { pastFirstDay: string; pastLastDay: string; nextFirstDay: string; nextLastDay: string };
  /** shares_attendance */
  attendance?: { startsAt: Date; title: string; status: AttendanceStatus; creditedMinutes: number }[];
  /** shares_hours */
  hours?: { weekMinutes: number; totalMinutes: number; minimumMinutes: number; courseTitle: string };
  /** shares_progress: the facts; the headline and reasons come from one assessment (assessWeek) */
  progress?: {
    signedItems: { code: string; title: string }[];
    stagesPassed: { code: string; title: string }[];
    makeupsToBook: { code: string; title: string }[];
    lateAssignments: number;
    /** null when attendance is not shared with this sponsor */
    missedSessions: number | null;
  };
  /** shares_outcomes: oral checks of the week and their results */
  outcomes?: { occurredAt: Date; outcome: "meets" | "not_yet"; items: string }[];
  /** shares_schedule */
  nextWeek?: { startsAt: Date; endsAt: Date; title: string; room: string }[];
  /** a note an instructor wrote for the sponsor */
  note?: { body: string; authorName: string } | null;
  unsubscribeUrl: string;
  oneClickUrl: string;
}

/** The progress bar: a two-cell table every mail client draws; its label says the numbers in words too. */
export function progressBar(done: number, total: number, label: string): Block {
  const pct = total > 0 ? Math.max(0, Math.min(100, Math.round((done / total) * 100))) : 0;
  const filled =
    pct > 0
      ? `<td width="${pct}%" bgcolor="${COLOURS.wing}" style="background-color:${COLOURS.wing};height:14px;font-size:1px;line-height:1px;">&nbsp;</td>`
      : "";
  const empty =
    pct < 100
      ? `<td width="${100 - pct}%" bgcolor="${COLOURS.edge}" style="background-color:${COLOURS.edge};height:14px;font-size:1px;line-height:1px;">&nbsp;</td>`
      : "";
  const words = `${label}: ${pct}%`;
  return {
    html:
      `<table role="img" aria-label="${esc(words)}" width="100%" cellpadding="0" cellspacing="0" border="0" style="border-collapse:collapse;margin:0 0 6px 0;border-radius:4px;"><tr>${filled}${empty}</tr></table>` +
      `<p style="margin:0 0 14px 0;font-size:13px;line-height:18px;color:${COLOURS.soft};">${esc(words)}</p>`,
    text: `[${"#".repeat(Math.round(pct / 5))}${".".repeat(20 - Math.round(pct / 5))}] ${words}`,
  };
}

function week(d: WeeklyLetterData): string {
  if (d.window) return `${dateLong(d.window.pastFirstDay)} to ${dateLong(d.window.pastLastDay)}`;
  const end = new Date(Date.parse(`${d.weekStart}T12:00:00Z`) + 6 * 86_400_000).toISOString().slice(0, 10);
  return `${dateLong(d.weekStart)} to ${dateLong(end)}`;
}

export function composeWeeklyLetter(d: WeeklyLetterData, school: MailSchool): ComposedMail {
  const blocks: Block[] = [];
  blocks.push(para(`Here is ${d.studentName}'s week at ${school.name} ground school, ${week(d)}.`));

  if (d.attendance) {
    blocks.push(heading("This week's sessions"));
    if (d.attendance.length === 0) blocks.push(para("No sessions were recorded this week."));
    else
      blocks.push(
        facts(
          d.attendance.map((a) => [
            whenShort(a.startsAt, school.timeZone),
            `${a.title}: ${ATTENDANCE_LABEL[a.status]}${a.creditedMinutes > 0 ? `, ${hoursLabel(a.creditedMinutes)} credited` : ""}`,
          ]),
        ),
      );
  }

  if (d.hours) {
    blocks.push(heading("Ground training hours"));
    blocks.push(
      facts([
        ["This week", hoursLabel(d.hours.weekMinutes)],
        ["So far", hoursLabel(d.hours.totalMinutes, d.hours.minimumMinutes)],
      ]),
    );
    blocks.push(
      progressBar(
        d.hours.totalMinutes,
        d.hours.minimumMinutes,
        `${hoursLabel(d.hours.totalMinutes)} of the ${hoursLabel(d.hours.minimumMinutes)} ${d.hours.courseTitle} minimum`,
      ),
    );
  }

  if (d.progress) {
    const p = d.progress;
    blocks.push(heading("Progress"));
    const a = assessWeek({
      makeupsToBook: p.makeupsToBook.length,
      missedSessions: p.missedSessions,
      lateAssignments: p.lateAssignments,
      milestones: p.signedItems.length + p.stagesPassed.length,
    });
    blocks.push(para(a.headline));
    if (a.reasons.length > 0) blocks.push(bullets(a.reasons));
    const milestones = [
      ...p.signedItems.map((i) => `Signed off: ${i.code} ${i.title}`),
      ...p.stagesPassed.map((s) => `Stage check passed: ${s.code} ${s.title}`),
    ];
    if (milestones.length > 0) {
      blocks.push(para("Milestones this week:"));
      blocks.push(bullets(milestones));
    }
    if (p.makeupsToBook.length > 0) {
      blocks.push(heading("Action needed"));
      blocks.push(para(`${p.makeupsToBook.length === 1 ? "A make-up needs" : "Make-ups need"} booking with the school:`));
      blocks.push(bullets(p.makeupsToBook.map((m) => `${m.code} ${m.title}`)));
    }
  }

  if (d.outcomes) {
    blocks.push(heading("Check results"));
    if (d.outcomes.length === 0) blocks.push(para("No oral checks this week."));
    else
      blocks.push(
        facts(
          d.outcomes.map((c) => [whenShort(c.occurredAt, school.timeZone), `Oral check on ${c.items}: ${CHECK_OUTCOME_WORDS[c.outcome]}`]),
        ),
      );
  }

  if (d.nextWeek) {
    blocks.push(heading(d.window ? `Coming up, to ${dateLong(d.window.nextLastDay)}` : "Next week"));
    if (d.nextWeek.length === 0) blocks.push(para("No sessions are planned yet."));
    else
      blocks.push(
        facts(
          d.nextWeek.map((s) => [
            whenShort(s.startsAt, school.timeZone),
            `${s.title} until ${timeOnly(s.endsAt, school.timeZone)}, ${s.room}`,
          ]),
        ),
      );
  }

  if (d.note) {
    blocks.push(heading(`A note from ${d.note.authorName}`));
    blocks.push(para(d.note.body));
  }

  const footer: Block[] = [
    {
      html: `<p style="margin:0 0 8px 0;font-size:12px;line-height:18px;color:${COLOURS.faint};">You receive this letter because ${esc(d.studentName)} named you as a sponsor. <a href="${esc(d.unsubscribeUrl)}" style="color:${COLOURS.wing};">Stop the Weekly letter about ${esc(d.studentName)}</a>.</p>`,
      text: `You receive this letter because ${d.studentName} named you as a sponsor. Stop the Weekly letter about ${d.studentName}: ${d.unsubscribeUrl}`,
    },
  ];
  const title = `Weekly letter: ${d.studentName}`;
  return {
    subject: oneLine(`Weekly letter: ${d.studentName}, week of ${dateLong(d.weekStart)}`),
    ...render({ school, title, greeting: `Dear ${firstName(d.sponsorName)},`, blocks, footer }),
    headers: {
      "List-Unsubscribe": `<${d.oneClickUrl}>`,
      "List-Unsubscribe-Post": "List-Unsubscribe=One-Click",
    },
  };
}
