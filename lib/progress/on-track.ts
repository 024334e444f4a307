import { differenceInCalendarDays, parseISO } from "date-fns";
import { formatDay, hoursLabel } from "@/lib/time";
import { QUESTION_OUTCOME_WORDS } from "@/lib/labels";

// "Am I on track?" for a student's This week card (pure). One line, with the plain reasons:
// credited ground hours against the pace the course needs by its planned end (the course minimum
// pro-rated over enrolment date → planned end), the items left before the next stage check, open
// make-ups, and items whose last oral-check question was marked Shaky or Not yet.

export interface OnTrackFacts {
  /** school's today, "yyyy-MM-dd" */
  today: string;
  creditedMinutes: number;
  minGroundMinutes: number;
  enrolledOn: string;
  /** null: no planned end date set, so no pace can be worked out */
  plannedEndOn: string | null;
  /** the next stage check: its code and the items still to be signed before it; null when every stage is passed */
  nextStage: { code: string; title: string; itemsLeft: number } | null;
  openMakeups: number;
  /** items whose last question was marked Shaky or Not yet */
  weakItems: { code: string; outcome: "shaky" | "not_yet" }[];
}

export interface OnTrackAssessment {
  standing: "on-track" | "behind";
  /** the one line shown: "On track: …" or "Behind: …" */
  line: string;
  /** the minutes the pace needs by today (null without a planned end) */
  neededMinutes: number | null;
  reasons: string[];
}

/** The share of the course minimum due by `today` on a straight line from enrolment to planned end (0 … minimum). */
export function paceMinutes(minGroundMinutes: number, enrolledOn: string, plannedEndOn: string, today: string): number {
  const total = differenceInCalendarDays(parseISO(plannedEndOn), parseISO(enrolledOn));
  if (total <= 0) return minGroundMinutes;
  const gone = Math.min(total, Math.max(0, differenceInCalendarDays(parseISO(today), parseISO(enrolledOn))));
  return Math.round((minGroundMinutes * gone) / total);
}

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

export function assessOnTrack(f: OnTrackFacts): OnTrackAssessment {
  const behind: string[] = [];
  const fine: string[] = [];
  const needed = f.plannedEndOn ? paceMinutes(f.minGroundMinutes, f.enrolledOn, f.plannedEndOn, f.today) : null;
  const hours = `${hoursLabel(f.creditedMinutes)} credited`;
  if (needed === null) {
    fine.push(`${hours} (no planned end date, so no pace to compare with)`);
  } else if (f.creditedMinutes < needed) {
    behind.push(`${hours}, the pace to finish by ${formatDay(f.plannedEndOn!)} needs ${hoursLabel(needed)} by now`);
  } else {
    fine.push(`${hours}, ${hoursLabel(needed)} needed by now to finish by ${formatDay(f.plannedEndOn!)}`);
  }
  if (f.openMakeups > 0) behind.push(`${plural(f.openMakeups, "make-up", "make-ups")} open`);
  const notYet = f.weakItems.filter((w) => w.outcome === "not_yet").map((w) => w.code);
  const shaky = f.weakItems.filter((w) => w.outcome === "shaky").map((w) => w.code);
  if (notYet.length > 0) behind.push(`${notYet.join(", ")} last marked ${QUESTION_OUTCOME_WORDS.not_yet}`);
  if (shaky.length > 0) behind.push(`${shaky.join(", ")} last marked ${QUESTION_OUTCOME_WORDS.shaky}`);
  const stage = f.nextStage
    ? f.nextStage.itemsLeft === 0
      ? `nothing left to sign before the ${f.nextStage.code} stage check`
      : `${plural(f.nextStage.itemsLeft, "item", "items")} left before the ${f.nextStage.code} stage check`
    : "every stage check passed";
  if (behind.length > 0) {
    return { standing: "behind", line: `Behind: ${[...behind, stage].join("; ")}.`, neededMinutes: needed, reasons: behind };
  }
  return { standing: "on-track", line: `On track: ${[...fine, stage].join("; ")}.`, neededMinutes: needed, reasons: [] };
}
