import { pagedDocument, printable } from "@/lib/pdf/paged";

export { printable };

/** The data the printable training record shows (plain values, already scoped and formatted). */
export interface TrainingRecordPdfInput {
  schoolName: string;
  studentName: string;
  enrolment: string[];
  groundSummary: string;
  groundLog: string[][];
  checks: { heading: string; lines: string[] }[];
  /** per sign-off: item, signed for, signer, the signer's certificate number, state, signature */
  signOffs: string[][];
  /** per stage check: stage, date, examiner, the examiner's certificate number, result, written / oral */
  stageChecks: string[][];
  /** syllabus items not yet signed off: code, stage, title */
  notYetDone: string[][];
  /** the chief instructor's certification of the printed record */
  certification: {
    statement: string;
    name: string;
    certificateNumber: string;
    /** filled when the chief has certified the record in Chalkwing (end of training, transfer out) */
    certified?: { on: string; auditHash: string };
  };
  headHash: string;
  headPosition: number;
  generatedAt: string;
}

/** The certification statement the chief instructor signs on the printed record. */
export function certificationStatement(p: { certifierName: string; studentName: string; schoolName: string }): string {
  return (
    `I, ${p.certifierName}, chief instructor of ${p.schoolName}, certify that this is a true and complete copy of the ground ` +
    `training record of ${p.studentName} as kept by the school on the date below, including the items not yet signed off.`
  );
}

/**
 * A paged PDF (pdf-lib, pure JS): every page carries the calculation caution (the record prints
 * computed answers and credited hours), "page x of y" and the audit chain's head hash.
 */
export async function trainingRecordPdf(input: TrainingRecordPdfInput): Promise<Uint8Array> {
  const { write, heading, table, keepTogether, skip, finish, bold, mono } = await pagedDocument(`Training record: ${input.studentName}`);

  write(input.schoolName, { f: bold, size: 10 });
  write(`Training record: ${input.studentName}`, { f: bold, size: 18, gap: 4 });
  for (const l of input.enrolment) write(l);
  heading("Ground log");
  write(input.groundSummary, { f: bold });
  table(["Date", "Session", "Attendance", "Credited"], input.groundLog, [0.17, 0.5, 0.18, 0.15]);
  heading("Sign-offs");
  table(["Item", "Signed for", "Signer", "Certificate", "State", "Signature"], input.signOffs, [0.26, 0.11, 0.16, 0.14, 0.16, 0.17]);
  heading("Stage checks");
  table(["Stage", "Date", "Examiner", "Certificate", "Result", "Written / oral"], input.stageChecks, [0.08, 0.12, 0.16, 0.14, 0.08, 0.42]);
  heading("Syllabus items not yet done");
  table(["Item", "Stage", "Title"], input.notYetDone, [0.15, 0.12, 0.73]);
  heading("Oral checks");
  if (input.checks.length === 0) write("None.");
  for (const c of input.checks) {
    write(c.heading, { f: bold, size: 9.5 });
    for (const l of c.lines) write(l, { indent: 12, size: 8.5 });
    skip(4);
  }

  heading("Certification by the chief instructor");
  keepTogether(150);
  write(input.certification.statement, { gap: 8 });
  write(`Name: ${input.certification.name}`);
  write(`Certificate number: ${input.certification.certificateNumber}`);
  if (input.certification.certified) {
    write(`Certified on: ${input.certification.certified.on}`);
    write(`Signed with password re-entry; audit chain event ${input.certification.certified.auditHash}`, { f: mono, size: 7.5 });
  } else {
    write("Date: ______________________", { gap: 18 });
    write("Signature: ____________________________________________");
  }

  return finish(() => `Audit chain head ${input.headHash} (${input.headPosition} events) · generated ${input.generatedAt}`);
}
