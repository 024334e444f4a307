import { QueryTypes } from "sequelize";
import { sequelize } from "../index";
import type { SeedContext } from "./extensions";
import type { CurrentUser } from "@/lib/auth/session";
import type { Role } from "@/lib/auth/roles";
import { recordOralCheck } from "../access/records/record-oral-check";
import { signOff } from "../access/records/sign-offs";
import { conductStageCheck } from "../access/records/stage-checks";
import { itemsOfRevision } from "../access/records/items";
import { scheduleSession } from "../access/timetable/schedule-session";
import { recordAttendance } from "../access/ground-log/record-attendance";
import { scheduleSessionSchema, recordAttendanceSchema } from "@/lib/timetable/schema";
import { setClock, resetClock } from "@/lib/clock";

// What the demo's course histories share (completion.ts, transfers.ts): the staff who write them,
// the course's facts, one-to-one sessions attended, and a student walked through every item and
// stage check of the course, written through the services (so the audit chain is real) with the
// clock moved to each moment.

export const DAY = 86_400_000;

/** The staff members `ids` as callers of the services. */
export async function seedStaff(ctx: SeedContext, ids: string[]): Promise<(id: string) => CurrentUser> {
  const staff = await sequelize.query<{ id: string; name: string; roles: Role[] }>(
    `SELECT id, name, roles FROM people WHERE id IN (:ids)`,
    {
      replacements: { ids },
      type: QueryTypes.SELECT,
      transaction: ctx.t,
    },
  );
  return (id) => {
    const p = staff.find((x) => x.id === id)!;
    return { id: p.id, name: p.name, roles: p.roles, schoolId: ctx.schoolId };
  };
}

/** The course's title and minimum of ground training minutes, and the school's name. */
export async function courseFacts(ctx: SeedContext): Promise<{ courseTitle: string; minGroundMinutes: number; schoolName: string }> {
  const [course] = await sequelize.query<{ title: string; min: number }>(
    `SELECT title, min_ground_minutes AS min FROM courses WHERE id = :id`,
    { replacements: { id: ctx.courseId }, type: QueryTypes.SELECT, transaction: ctx.t },
  );
  const [school] = await sequelize.query<{ name: string }>(`SELECT name FROM schools WHERE id = :id`, {
    replacements: { id: ctx.schoolId },
    type: QueryTypes.SELECT,
    transaction: ctx.t,
  });
  return { courseTitle: course!.title, minGroundMinutes: course!.min, schoolName: school!.name };
}

export type ClockAt = <T>(daysAgo: number, minutes: number, fn: () => Promise<T>) => Promise<T>;

/** `at(daysAgo, minutes, fn)` runs `fn` with the clock at `daysAgo` days before `start` plus `minutes`, then puts the clock back. */
export function clockAt(start: Date): ClockAt {
  return async (daysAgo, minutes, fn) => {
    setClock(() => new Date(start.getTime() - daysAgo * DAY + minutes * 60_000));
    try {
      return await fn();
    } finally {
      resetClock();
    }
  };
}

/**
 * `count` one-to-one sessions of the school's first briefing in Briefing room 2, a week apart from
 * `firstDay` (days from today), scheduled by the instructor, who records the student as attended.
 */
export async function attendOneToOne(
  ctx: SeedContext,
  instructor: CurrentUser,
  studentId: string,
  plan: { count: number; firstDay: number; time: string; sessionMinutes: number },
): Promise<void> {
  const { t } = ctx;
  const [briefing] = await sequelize.query<{ id: string }>(
    `SELECT id FROM briefings WHERE school_id = :s ORDER BY created_at, id LIMIT 1`,
    { replacements: { s: ctx.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  for (let n = 0; n < plan.count; n++) {
    const s = await scheduleSession(
      instructor,
      scheduleSessionSchema.parse({
        briefingId: briefing!.id,
        date: ctx.day(plan.firstDay + n * 7),
        time: plan.time,
        durationMinutes: plan.sessionMinutes,
        room: "Briefing room 2",
        instructorId: instructor.id,
        studentIds: [studentId],
      }),
      t,
    );
    await recordAttendance(instructor, recordAttendanceSchema.parse({ sessionId: s.id, lines: [{ studentId, status: "attended" }] }), t);
  }
}

/**
 * Walks the student through every item of the course's revision, stage by stage, one item a day
 * from `fromDaysAgo` days before `start` (an oral check with one solid answer at minute 30, the
 * sign-off at minute 60), each stage ending with a passed stage check: held the day after the
 * stage's last item (`"next day"`, at the start of that day) or on that day after its sign-off
 * (`"same day"`, minute 90); the check is recorded at minute 90 of its day.
 */
export async function walkThroughCourse(
  ctx: SeedContext,
  examiner: CurrentUser,
  walk: {
    studentId: string;
    start: Date;
    fromDaysAgo: number;
    stageCheck: "next day" | "same day";
    writtenScorePercent: number;
    password: string;
  },
): Promise<void> {
  const { t } = ctx;
  const { studentId, start, password } = walk;
  const at = clockAt(start);
  const items = await itemsOfRevision(ctx.revisionId, t);
  const stages = [...new Set(items.map((i) => i.stageId))];
  let daysAgo = walk.fromDaysAgo;
  for (const stageId of stages) {
    const own = items.filter((i) => i.stageId === stageId);
    for (const i of own) {
      daysAgo -= 1;
      await at(daysAgo, 30, () =>
        recordOralCheck(t, examiner, {
          studentId,
          itemIds: [i.id],
          levelShown: "correlation",
          remarks: "",
          durationMinutes: 10,
          occurredAt: new Date(start.getTime() - daysAgo * DAY),
          questions: [
            {
              syllabusItemId: i.id,
              questionText: `Explain ${i.title.toLowerCase()} in your own words.`,
              answerSummary: "Clear and complete.",
              outcome: "solid",
              required: true,
              prompted: false,
              correctiveGiven: false,
            },
          ],
        }),
      );
      await at(daysAgo, 60, () => signOff(t, examiner, { studentId, itemId: i.id, password }));
    }
    if (walk.stageCheck === "next day") daysAgo -= 1;
    const heldAtMinutes = walk.stageCheck === "next day" ? 0 : 90;
    await at(daysAgo, 90, () =>
      conductStageCheck(t, examiner, {
        studentId,
        stageId,
        result: "pass",
        oralOutcomes: own.map((i) => ({ itemId: i.id, outcome: "solid" as const })),
        writtenScorePercent: walk.writtenScorePercent,
        remarks: "",
        occurredAt: new Date(start.getTime() - daysAgo * DAY + heldAtMinutes * 60_000),
        password,
      }),
    );
  }
}
