import type { SeedContext } from "./extensions";
import { createPerson } from "../access/people/create-person";
import { enrol } from "../access/cohorts/enrol";
import { itemsOfRevision } from "../access/records/items";
import { endTraining } from "../access/completion/end-training";
import { endorse } from "../access/endorsements/endorse";
import { recordResult } from "../access/endorsements/results";
import { recordTransferCredit } from "../access/transfers/record-credit";
import { transferCapMinutes } from "@/lib/transfers/cap";
import { proposedStatement } from "@/lib/completion/statements";
import { now } from "@/lib/clock";
import { DEMO_PASSWORD } from "./scenario";
import { attendOneToOne, clockAt, courseFacts, seedStaff, walkThroughCourse } from "./walk-through";

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
  const chief = (await seedStaff(ctx, [ctx.people.chief]))(ctx.people.chief);
  const facts = await courseFacts(ctx);
  const start = now();
  // calendar days fixed before the clock is moved (ctx.day counts from the clock's today)
  const testOn = ctx.day(-118);
  const endorsedOn = ctx.day(-9);
  const takenOn = ctx.day(-4);
  const at = clockAt(start);

  // ---- Odile Ferreira: transfer in, capped credit, then endorsed with a result ----
  const odile = await createPerson(
    { schoolId: ctx.schoolId, name: "Odile Ferreira", email: "odile.ferreira@chalkwing.test", roles: ["student"], password },
    t,
  );
  await enrol({ studentId: odile.id, courseId: ctx.courseId, revisionId: ctx.revisionId, enrolledOn: ctx.day(-120) }, t);
  const items = await itemsOfRevision(ctx.revisionId, t);
  const firstStage = items.filter((i) => i.stageId === items[0]?.stageId);
  const cap = transferCapMinutes(facts.minGroundMinutes, true);
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
  const sessionMinutes = 120;
  await attendOneToOne(ctx, chief, odile.id, {
    count: Math.ceil((facts.minGroundMinutes - cap) / sessionMinutes),
    firstDay: -110,
    time: "17:30",
    sessionMinutes,
  });
  await walkThroughCourse(ctx, chief, {
    studentId: odile.id,
    start,
    fromDaysAgo: 40,
    stageCheck: "same day",
    writtenScorePercent: 88,
    password,
  });
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
      schoolName: facts.schoolName,
      courseTitle: facts.courseTitle,
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
