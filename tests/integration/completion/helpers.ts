import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { TEST_PASSWORD } from "@/tests/helpers/factories";
import { endTrainingAction } from "@/app/(app)/completion/actions";
import { conductStageCheck } from "@/db/access/records/stage-checks";
import { itemsOfRevision } from "@/db/access/records/items";
import { dateInZone } from "@/lib/time";
import { check, sign, type School } from "../records/helpers";

// What the tests of a student's course and its end share (end of training, withdrawal,
// endorsements, the inspection pack).

/** Today in the school's time zone. */
export const today = () => dateInZone(new Date(), "Europe/London");
export const statement = "I certify that this training record is true and complete as kept by the school.";

type Item = Awaited<ReturnType<typeof itemsOfRevision>>[number];

/**
 * Every item of the course checked (one Solid answer, by Instructor One) and signed, and every stage
 * check passed (the chief examines, 92 % written). `checkOf` overrides an item's oral check,
 * `onSigned` hears of each sign-off, and `skipLastStageCheck` leaves the last stage check untaken.
 */
export async function completeCourse(
  s: School,
  studentId: string,
  opts: {
    checkOf?: (item: Item) => Parameters<typeof check>[3];
    onSigned?: (item: Item, signOffId: string) => void;
    skipLastStageCheck?: boolean;
  } = {},
): Promise<void> {
  const items = await itemsOfRevision(s.revision.id);
  const stages = [...new Set(items.map((i) => i.stageId))];
  for (const [n, stageId] of stages.entries()) {
    const own = items.filter((i) => i.stageId === stageId);
    for (const i of own) {
      await check(s.as.instructor, studentId, [i.id], opts.checkOf?.(i));
      const so = await sign(s.as.instructor, { studentId, itemId: i.id });
      opts.onSigned?.(i, so.id);
    }
    if (opts.skipLastStageCheck && n === stages.length - 1) continue;
    await sequelize.transaction((t) =>
      conductStageCheck(t, s.as.chief, {
        studentId,
        stageId,
        result: "pass",
        oralOutcomes: own.map((i) => ({ itemId: i.id, outcome: "solid" as const })),
        writtenScorePercent: 92,
        remarks: "",
        occurredAt: new Date(Date.now() - 60_000),
        password: TEST_PASSWORD,
      }),
    );
  }
}

/** The end-of-training action as the current caller, ending today with the certification statement and the test password (override any of them). */
export function endTrainingToday(input: { studentId: string; kind: string; reason: string } & Record<string, unknown>) {
  return endTrainingAction({ endedOn: today(), statement, password: TEST_PASSWORD, ...input });
}

/** The student's enrolment: its status and how it ended. */
export async function enrolment(studentId: string) {
  const [r] = await sequelize.query<{ status: string; ended_on: string | null; end_reason: string | null; end_kind: string | null }>(
    `SELECT status, ended_on, end_reason, end_kind FROM enrolments WHERE student_id = :studentId`,
    { replacements: { studentId }, type: QueryTypes.SELECT },
  );
  return r!;
}
