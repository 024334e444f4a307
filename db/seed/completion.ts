import { sequelize } from "../index";
import type { SeedContext } from "./extensions";
import { createPerson } from "../access/people/create-person";
import { enrol } from "../access/cohorts/enrol";
import { endTraining } from "../access/completion/end-training";
import { proposedStatement } from "@/lib/completion/statements";
import { now } from "@/lib/clock";
import { DEMO_PASSWORD } from "./scenario";
import { attendOneToOne, courseFacts, seedStaff, walkThroughCourse } from "./walk-through";

/**
 * End of training in the demo (all invented): Ines Varga attended the course's minimum of ground
 * training time in one-to-one afternoon sessions with Rafael (recorded through the Timetable and Ground log, as
 * Odile Ferreira's in transfers.ts), completed every item and stage check of the course, written
 * through the Records services so the audit chain is real (walk-through.ts), and graduated three days ago with the
 * chief's certification (14 CFR 141.95(a): the course completed, its minimum ground time included);
 * the school's certificate number is set.
 */
export async function seedCompletion(ctx: SeedContext, password = DEMO_PASSWORD): Promise<void> {
  const { t } = ctx;
  await sequelize.query(`UPDATE schools SET settings = settings || '{"schoolCertificateNumber":"LFS-P-2231"}'::jsonb WHERE id = :id`, {
    replacements: { id: ctx.schoolId },
    transaction: t,
  });
  const as = await seedStaff(ctx, [ctx.people.chief, ctx.people.rafael]);
  // the graduate has no cohort now, so the chief (who sees every student) recorded her checks
  const chief = as(ctx.people.chief);
  const ines = await createPerson(
    { schoolId: ctx.schoolId, name: "Ines Varga", email: "ines.varga@chalkwing.test", roles: ["student"], password },
    t,
  );
  await enrol({ studentId: ines.id, courseId: ctx.courseId, revisionId: ctx.revisionId, enrolledOn: ctx.day(-170) }, t);

  // the course's minimum of ground training, taught one-to-one by Rafael (his own sessions, so he
  // schedules them and records her attendance) in two-hour afternoon sessions in Briefing room 2
  const facts = await courseFacts(ctx);
  const sessionMinutes = 120;
  await attendOneToOne(ctx, as(ctx.people.rafael), ines.id, {
    count: Math.ceil(facts.minGroundMinutes / sessionMinutes),
    firstDay: -165,
    time: "15:00",
    sessionMinutes,
  });

  await walkThroughCourse(ctx, chief, {
    studentId: ines.id,
    start: now(),
    fromDaysAgo: 150,
    stageCheck: "next day",
    writtenScorePercent: 91,
    password,
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
      schoolName: facts.schoolName,
      courseTitle: facts.courseTitle,
    }),
    password,
  });
}
