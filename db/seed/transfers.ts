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
import { endorse } from "../access/endorsements/endorse";
import { recordResult } from "../access/endorsements/results";
import { recordTransferCredit } from "../access/transfers/record-credit";
import { transferCapMinutes } from "@/lib/transfers/cap";
import { scheduleSessionSchema, recordAttendanceSchema } from "@/lib/timetable/schema";
import { proposedStatement } from "@/lib/completion/statements";
import { now, setClock, resetClock } from "@/lib/clock";
import { DEMO_PASSWORD } from "./scenario";

const DAY = 86_400_000;

/**
 * Transfers in and retention in the demo (all invented):
 * - Odile Ferreira transferred in from "Saltmarsh Aero Club" (an approved course): credited with
 *   exactly the 14 CFR 141.77(c) cap (50% of the ground minimum) and the first stage's items, on
 *   this school's knowledge test; she attended sessions here for the rest of the minimum, every item
 *   is signed and every stage check passed, she was endorsed for the knowledge test and passed it.
 * - Casimir Wetherell transferred out four years ago: his record is past every retention period
 *   and waits on the chief's archive list.
 */
export async function seedTransfers(ctx: SeedContext, password = DEMO_PASSWORD): Promise<void> {
  const { t } = ctx;
  const [p] = await sequelize.query<{ id: string; name: string; roles: Role[] }>(`SELECT id, name, roles FROM people WHERE id = :id`, {
    replacements: { id: ctx.people.chief },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  const chief: CurrentUser = { id: p!.id, name: p!.name, roles: p!.roles, schoolId: ctx.schoolId };
  const [course] = await sequelize.query<{ title: string; min: number }>(
    `SELECT title, min_ground_minutes AS min FROM courses WHERE id = :id`,
    { replacements: { id: ctx.courseId }, type: QueryTypes.SELECT, transaction: t },
  );
  const [school] = await sequelize.query<{ name: string }>(`SELECT name FROM schools WHERE id = :id`, {
    replacements: { id: ctx.schoolId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  const start = now();
  // calendar days fixed before the clock is moved (ctx.day counts from the clock's today)
  const testOn = ctx.day(-118);
  const endorsedOn = ctx.day(-9);
  const takenOn = ctx.day(-4);
  const at = async <T>(daysAgo: number, minutes: number, fn: () => Promise<T>): Promise<T> => {
    setClock(() => new Date(start.getTime() - daysAgo * DAY + minutes * 60_000));
    try {
      return await fn();
    } finally {
      resetClock();
    }
  };

  // ---- Odile Ferreira: transfer in, capped credit, then endorsed with a result ----
  const odile = await createPerson(
    { schoolId: ctx.schoolId, name: "Odile Ferreira", email: "odile.ferreira@chalkwing.test", roles: ["student"], password },
    t,
  );
  await enrol({ studentId: odile.id, courseId: ctx.courseId, revisionId: ctx.revisionId, enrolledOn: ctx.day(-120) }, t);
  const items = await itemsOfRevision(ctx.revisionId, t);
  const stages = [...new Set(items.map((i) => i.stageId))];
  const firstStage = items.filter((i) => i.stageId === stages[0]);
  const cap = transferCapMinutes(course!.min, true);
  await at(118, 600, () =>
    recordTransferCredit(
      t,
      chief,
      {
        studentId: odile.id,
        sourceSchool: "Saltmarsh Aero Club",
        sourceApproved: "yes",
        creditedMinutes: cap,
        itemIds: firstStage.map((i) => i.id),
        testKind: "knowledge",
        testTakenOn: testOn,
        testResult: "Passed, 84% on this school's stage 1 knowledge test",
        note: "Her logbook shows 21 h of ground school at Saltmarsh; credit is capped at half of our minimum.",
      },
      { fileName: "saltmarsh-ground-school-record.pdf", contentType: "application/pdf", bytes: evidencePdf() },
    ),
  );
  // the rest of the minimum taught here: one-to-one evening sessions in Briefing room 2
  const [briefing] = await sequelize.query<{ id: string }>(
    `SELECT id FROM briefings WHERE school_id = :s ORDER BY created_at, id LIMIT 1`,
    { replacements: { s: ctx.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  const sessionMinutes = 120;
  const sessions = Math.ceil((course!.min - cap) / sessionMinutes);
  for (let n = 0; n < sessions; n++) {
    const s = await scheduleSession(
      chief,
      scheduleSessionSchema.parse({
        briefingId: briefing!.id,
        date: ctx.day(-110 + n * 7),
        time: "17:30",
        durationMinutes: sessionMinutes,
        room: "Briefing room 2",
        instructorId: chief.id,
        studentIds: [odile.id],
      }),
      t,
    );
    await recordAttendance(
      chief,
      recordAttendanceSchema.parse({ sessionId: s.id, lines: [{ studentId: odile.id, status: "attended" }] }),
      t,
    );
  }
  let daysAgo = 40;
  for (const stageId of stages) {
    const own = items.filter((i) => i.stageId === stageId);
    for (const i of own) {
      daysAgo -= 1;
      await at(daysAgo, 30, () =>
        recordOralCheck(t, chief, {
          studentId: odile.id,
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
      await at(daysAgo, 60, () => signOff(t, chief, { studentId: odile.id, itemId: i.id, password }));
    }
    await at(daysAgo, 90, () =>
      conductStageCheck(t, chief, {
        studentId: odile.id,
        stageId,
        result: "pass",
        oralOutcomes: own.map((i) => ({ itemId: i.id, outcome: "solid" as const })),
        writtenScorePercent: 88,
        remarks: "",
        occurredAt: new Date(start.getTime() - daysAgo * DAY + 90 * 60_000),
        password,
      }),
    );
  }
  const endorsement = await at(9, 600, () => endorse(t, chief, { studentId: odile.id, endorsedOn, password }));
  await at(4, 900, () => recordResult(t, chief, { endorsementId: endorsement.endorsementId, takenOn, scorePercent: 86, areasMissed: [] }));

  // ---- Casimir Wetherell: transferred out four years ago, past retention ----
  const casimir = await createPerson(
    { schoolId: ctx.schoolId, name: "Casimir Wetherell", email: "casimir.wetherell@chalkwing.test", roles: ["student"], password },
    t,
  );
  await enrol({ studentId: casimir.id, courseId: ctx.courseId, revisionId: ctx.revisionId, enrolledOn: ctx.day(-4 * 365 - 90) }, t);
  await endTraining(t, chief, {
    studentId: casimir.id,
    kind: "transferred",
    endedOn: ctx.day(-4 * 365),
    reason: "Moved away; continued at a school nearer home.",
    statement: proposedStatement({
      kind: "transferred",
      certifierName: chief.name,
      studentName: "Casimir Wetherell",
      schoolName: school!.name,
      courseTitle: course!.title,
    }),
    password,
  });
}

/** A one-page PDF (ISO 32000-1: header, objects, cross-reference table, trailer) standing for the earlier school's record. */
function evidencePdf(): Buffer {
  const text = "Saltmarsh Aero Club - ground school record of Odile Ferreira (demo evidence)";
  const stream = `BT /F1 11 Tf 56 780 Td (${text}) Tj ET`;
  const objects = [
    "<< /Type /Catalog /Pages 2 0 R >>",
    "<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
    "<< /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] /Resources << /Font << /F1 4 0 R >> >> /Contents 5 0 R >>",
    "<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>",
    `<< /Length ${stream.length} >>\nstream\n${stream}\nendstream`,
  ];
  let body = "%PDF-1.4\n";
  const offsets: number[] = [];
  objects.forEach((o, i) => {
    offsets.push(body.length);
    body += `${i + 1} 0 obj\n${o}\nendobj\n`;
  });
  const xref = body.length;
  body += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n`;
  for (const off of offsets) body += `${String(off).padStart(10, "0")} 00000 n \n`;
  body += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return Buffer.from(body, "latin1");
}
