import type { Transaction } from "sequelize";
import { seedTimetable } from "./timetable";
import { seedCurveLab } from "./curve-lab";
import { seedBriefings } from "./briefings";
import { seedRecords } from "./records";
import { seedMail } from "./mail";
import { seedStudentWeek } from "./student-week";
import { seedCompletion } from "./completion";
import { seedTransfers } from "./transfers";

export interface SeedContext {
  t: Transaction;
  schoolId: string;
  courseId: string;
  revisionId: string;
  people: { chief: string; instructor: string; priya: string; rafael: string; sponsor: string };
  /** student e-mail → person id */
  students: Record<string, string>;
  cohorts: { a: string; b: string };
  /** calendar date `offset` days from today, "yyyy-MM-dd" */
  day: (offset: number) => string;
}

/**
 * Each capability adds its own demo data here (aircraft profiles, briefings, sessions, checks…),
 * through its own services, in the same transaction as the foundation's scenario.
 */
const extensions: { name: string; run: (ctx: SeedContext) => Promise<void> }[] = [
  { name: "curve-lab", run: seedCurveLab },
  // briefings use Curve Lab's demos: keep it after curve-lab
  { name: "briefings", run: seedBriefings },
  // the Timetable schedules the briefings: keep it after the briefings seed
  { name: "timetable", run: seedTimetable },
  // records sign off items that the timetable's attendance and make-up items may touch
  { name: "records", run: seedRecords },
  // planned ends, the knowledge test date and the demo student's practice: after the demos and records
  { name: "student-week", run: seedStudentWeek },
  // a graduate with every item signed and the chief's certification: after the records seed
  { name: "completion", run: seedCompletion },
  // a transfer-in endorsed with a result (sessions in Briefing room 2) and a record past retention: after the timetable and completion seeds
  { name: "transfers", run: seedTransfers },
  // a note for the demo sponsor and the Weekly letters already sent, composed from everything above: keep it last
  { name: "mail", run: seedMail },
];

export async function runSeedExtensions(ctx: SeedContext): Promise<void> {
  for (const ext of extensions) await ext.run(ctx);
}
