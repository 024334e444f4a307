import { PDFDocument, StandardFonts, rgb, type PDFFont, type PDFPage } from "pdf-lib";
import { CAUTION_TEXT } from "@/lib/caution";

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

const A4: [number, number] = [595.28, 841.89];
const MARGIN = 50;
const FOOT = 58;
const CAUTION_SIZE = 7;

/** Helvetica speaks WinAnsi only: strip accents and replace anything else it cannot print. */
export function printable(s: string): string {
  return s
    .normalize("NFD")
    .replace(/[\u0300-\u036f]/g, "")
    .replace(/[‐-―]/g, "-")
    .replace(/[“”]/g, '"')
    .replace(/[‘’]/g, "'")
    .replace(/[^\x20-\x7e\xa0-\xff]/g, "?");
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
  const doc = await PDFDocument.create();
  doc.setTitle(printable(`Training record: ${input.studentName}`));
  doc.setProducer("Chalkwing");
  const font = await doc.embedFont(StandardFonts.Helvetica);
  const bold = await doc.embedFont(StandardFonts.HelveticaBold);
  const mono = await doc.embedFont(StandardFonts.Courier);
  let page: PDFPage = doc.addPage(A4);
  let y = A4[1] - MARGIN;
  const width = A4[0] - 2 * MARGIN;

  const newPage = () => {
    page = doc.addPage(A4);
    y = A4[1] - MARGIN;
  };
  const wrap = (text: string, f: PDFFont, size: number, max: number): string[] => {
    const out: string[] = [];
    for (const para of printable(text).split("\n")) {
      let line = "";
      for (const word of para.split(" ")) {
        const next = line ? `${line} ${word}` : word;
        if (f.widthOfTextAtSize(next, size) > max && line) {
          out.push(line);
          line = word;
        } else line = next;
      }
      out.push(line);
    }
    return out;
  };
  const write = (text: string, opts: { f?: PDFFont; size?: number; indent?: number; gap?: number } = {}) => {
    const f = opts.f ?? font;
    const size = opts.size ?? 9.5;
    const indent = opts.indent ?? 0;
    for (const l of wrap(text, f, size, width - indent)) {
      if (y - size < MARGIN + FOOT) newPage();
      page.drawText(l, { x: MARGIN + indent, y: y - size, size, font: f, color: rgb(0.11, 0.13, 0.19) });
      y -= size + 3.5;
    }
    y -= opts.gap ?? 0;
  };
  const heading = (text: string) => {
    if (y < MARGIN + FOOT + 60) newPage();
    y -= 8;
    write(text, { f: bold, size: 12.5, gap: 2 });
  };
  const table = (header: string[], rows: string[][], widths: number[]) => {
    const row = (cells: string[], f: PDFFont) => {
      const wrapped = cells.map((c, i) => wrap(c, f, 8.5, widths[i]! * width - 4));
      const h = Math.max(...wrapped.map((w) => w.length)) * 11;
      if (y - h < MARGIN + FOOT) newPage();
      let x = MARGIN;
      wrapped.forEach((lines, i) => {
        lines.forEach((l, j) => page.drawText(l, { x, y: y - 9 - j * 11, size: 8.5, font: f }));
        x += widths[i]! * width;
      });
      y -= h + 3;
    };
    row(header, bold);
    if (rows.length === 0) write("None.", { size: 8.5 });
    for (const r of rows) row(r, font);
  };

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
    y -= 4;
  }

  heading("Certification by the chief instructor");
  if (y < MARGIN + FOOT + 150) newPage();
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

  const pages = doc.getPages();
  const caution = wrap(`Caution: ${CAUTION_TEXT}`, font, CAUTION_SIZE, width);
  pages.forEach((p, i) => {
    caution.forEach((l, j) =>
      p.drawText(l, {
        x: MARGIN,
        y: 36 + (caution.length - 1 - j) * (CAUTION_SIZE + 2),
        size: CAUTION_SIZE,
        font,
        color: rgb(0.45, 0.2, 0.05),
      }),
    );
    const foot = printable(`Audit chain head ${input.headHash} (${input.headPosition} events) · generated ${input.generatedAt}`);
    p.drawText(foot, { x: MARGIN, y: 26, size: 6.5, font: mono, color: rgb(0.3, 0.33, 0.4) });
    const label = `Page ${i + 1} of ${pages.length}`;
    p.drawText(label, { x: A4[0] - MARGIN - font.widthOfTextAtSize(label, 8), y: 26, size: 8, font });
  });
  return doc.save();
}
