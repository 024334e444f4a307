// One assessment of a student's week (pure), from which the Weekly letter and the sponsor's Today
// take both their headline and their reasons, so the words can never disagree: "Behind" always
// comes with its reasons, and a week with reasons is never called good.

export interface WeekFacts {
  /** open make-up items still to be booked */
  makeupsToBook: number;
  /** sessions of the week missed without an excuse (null: attendance is not shared) */
  missedSessions: number | null;
  /** assignments past their due date and not done */
  lateAssignments: number;
  /** items signed off and stage checks passed in the week */
  milestones: number;
}

export type Standing = "behind" | "on-track" | "good-week";

export interface WeekAssessment {
  standing: Standing;
  /** one line: the headline of the progress section */
  headline: string;
  /** why the student is behind; empty unless `standing` is "behind" */
  reasons: string[];
}

const count = (n: number, one: string, many: string) => (n === 1 ? one : `${n} ${many}`);

export function assessWeek(f: WeekFacts): WeekAssessment {
  const reasons: string[] = [];
  if (f.makeupsToBook > 0) reasons.push(`${count(f.makeupsToBook, "one make-up item is", "make-up items are")} still to be booked`);
  if (f.missedSessions && f.missedSessions > 0)
    reasons.push(`${count(f.missedSessions, "one session", "sessions")} missed this week without an excuse`);
  if (f.lateAssignments > 0)
    reasons.push(`${count(f.lateAssignments, "one assignment is", "assignments are")} past the due date and not done`);
  if (reasons.length > 0)
    return {
      standing: "behind",
      headline: `Behind: ${count(reasons.length, "one thing needs", "things need")} catching up.`,
      reasons,
    };
  if (f.milestones > 0)
    return {
      standing: "good-week",
      headline: `On track, with ${count(f.milestones, "one milestone", "milestones")} this week.`,
      reasons,
    };
  return { standing: "on-track", headline: "On track: nothing is outstanding.", reasons };
}
