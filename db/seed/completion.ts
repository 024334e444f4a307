import { QueryTypes } from "sequelize";
import { sequelize } from "../index";
import type { SeedContext } from "./extensions";
import type { CurrentUser } from "@/lib/auth/session";
import type { Role } from "@/lib/auth/roles";
import { createPerson } from "../access/people/create-person";
import { enrol } from "../access/cohorts/enrol";
import { recordOralCheck } from "../access/records/record-oral-check";
import { signOff } from "../access/records/sign-offs";
import { conductStageCheck } from "../access/records/stage-checks";
import { itemsOfRevision } from "../access/records/items";
import { scheduleSession } from "../access/timetable/schedule-session";
import { recordAttendance } from "../access/ground-log/record-attendance";
import { endTraining } from "../access/completion/end-training";
import { scheduleSessionSchema, recordAttendanceSchema } from "@/lib/timetable/schema";
import { proposedStatement } from "@/lib/completion/statements";
import { now, setClock, resetClock } from "@/lib/clock";
import { DEMO_PASSWORD } from "./scenario";

const DAY = 86_400_000;

/**
 * End of training in the demo (all invented): Ines Varga attended the course's minimum of ground
 * training time in one-to-one afternoon sessions with Rafael (recorded through the Timetable and Ground log, as
 * Odile Ferreira's in transfers.ts), completed every item and stage check of the course, written
 * through the Records services so the audit chain is real, and graduated three days ago with the
 * chief's certification (14 CFR 141.95(a): the course completed, its minimum ground time included);
 * the school's certificate number is set.
 */
export async function seedCompletion(ctx: SeedContext, password = DEMO_PASSWORD): Promise<void> {
  const { t } = ctx;
  await sequelize.query(`UPDATE schools SET settings = settings || '{"schoolCertificateNumber":"LFS-P-2231"}'::jsonb WHERE id = :id`, {
    replacements: { id: ctx.schoolId },
    transaction: t,
  });
  const staff = await sequelize.query<{ id: string; name: string; roles: Role[] }>(
    `SELECT id, name, roles FROM people WHERE id IN (:ids)`,
    {
      replacements: { ids: [ctx.people.chief, ctx.people.rafael] },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  const as = (id: string): CurrentUser => {
    const p = staff.find((x) => x.id === id)!;
    return { id: p.id, name: p.name, roles: p.roles, schoolId: ctx.schoolId };
  };
  // the graduate has no cohort now, so the chief (who sees every student) recorded her checks
  const chief = as(ctx.people.chief);
  const ines = await createPerson(
    { schoolId: ctx.schoolId, name: "Ines Varga", email: "ines.varga@chalkwing.test", roles: ["student"], password },
    t,
  );
  await enrol({ studentId: ines.id, courseId: ctx.courseId, revisionId: ctx.revisionId, enrolledOn: ctx.day(-170) }, t);

  // the course's minimum of ground training, taught one-to-one by Rafael (his own sessions, so he
  // schedules them and records her attendance) in two-hour sessions in Briefing room 2
  const rafael = as(ctx.people.rafael);
  const [briefing] = await sequelize.query<{ id: string }>(
    `SELECT id FROM briefings WHERE school_id = :s ORDER BY created_at, id LIMIT 1`,
    { replacements: { s: ctx.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  const [minimum] = await sequelize.query<{ min: number }>(`SELECT min_ground_minutes AS min FROM courses WHERE id = :id`, {
    replacements: { id: ctx.courseId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  const sessionMinutes = 120;
  for (let n = 0; n < Math.ceil(minimum!.min / sessionMinutes); n++) {
    const s = await scheduleSession(
      rafael,
      scheduleSessionSchema.parse({
        briefingId: briefing!.id,
        date: ctx.day(-165 + n * 7),
        time: "15:00",
        durationMinutes: sessionMinutes,
        room: "Briefing room 2",
        instructorId: rafael.id,
        studentIds: [ines.id],
      }),
      t,
    );
    await recordAttendance(
      rafael,
      recordAttendanceSchema.parse({ sessionId: s.id, lines: [{ studentId: ines.id, status: "attended" }] }),
      t,
    );
  }

  const start = now();
  const at = async <T>(daysAgo: number, minutes: number, fn: () => Promise<T>): Promise<T> => {
    setClock(() => new Date(start.getTime() - daysAgo * DAY + minutes * 60_000));
    try {
      return await fn();
    } finally {
      resetClock();
    }
  };
  const items = await itemsOfRevision(ctx.revisionId, t);
  const stages = [...new Set(items.map((i) => i.stageId))];
  let daysAgo = 150;
  for (const stageId of stages) {
    const own = items.filter((i) => i.stageId === stageId);
    for (const i of own) {
      daysAgo -= 1;
      await at(daysAgo, 30, () =>
        recordOralCheck(t, chief, {
          studentId: ines.id,
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
      await at(daysAgo, 60, () => signOff(t, chief, { studentId: ines.id, itemId: i.id, password }));
    }
    daysAgo -= 1;
    await at(daysAgo, 90, () =>
      conductStageCheck(t, chief, {
        studentId: ines.id,
        stageId,
        result: "pass",
        oralOutcomes: own.map((i) => ({ itemId: i.id, outcome: "solid" as const })),
        writtenScorePercent: 91,
        remarks: "",
        occurredAt: new Date(start.getTime() - daysAgo * DAY),
        password,
      }),
    );
  }
  const [course] = await sequelize.query<{ title: string }>(`SELECT title FROM courses WHERE id = :id`, {
    replacements: { id: ctx.courseId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  const [school] = await sequelize.query<{ name: string }>(`SELECT name FROM schools WHERE id = :id`, {
    replacements: { id: ctx.schoolId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  await endTraining(t, chief, {
    studentId: ines.id,
    kind: "graduated",
    endedOn: ctx.day(-3),
    reason: "Every stage check and the end-of-course test passed.",
    statement: proposedStatement({
      kind: "graduated",
      certifierName: chief.name,
      studentName: "Ines Varga",
      schoolName: school!.name,
      courseTitle: course!.title,
    }),
    password,
  });
}
