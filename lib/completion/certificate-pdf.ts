import { PDFDocument, StandardFonts, rgb } from "pdf-lib";
import { printable } from "@/lib/records/training-record-pdf";
import { formatDay } from "@/lib/time";

// The graduation certificate (14 CFR 141.95(b)): one landscape page from pdf-lib (pure JS). It
// carries the school's name and certificate number, the graduate, the course, the date, the
// statement that every stage and its tests were completed, and the chief instructor's certification.

export interface CertificatePdfInput {
  schoolName: string;
  schoolCertificateNumber: string | null;
  graduateName: string;
  course: string;
  graduatedOn: string;
  completionStatement: string;
  certification: { statement: string; name: string; certificateNumber: string | null; certifiedOn: string; auditHash: string };
  certificateId: string;
}

const PAGE: [number, number] = [841.89, 595.28];

export async function graduationCertificatePdf(input: CertificatePdfInput): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  doc.setTitle(printable(`Graduation certificate: ${input.graduateName}`));
  doc.setProducer("Chalkwing");
  const font = await doc.embedFont(StandardFonts.TimesRoman);
  const bold = await doc.embedFont(StandardFonts.TimesRomanBold);
  const mono = await doc.embedFont(StandardFonts.Courier);
  const page = doc.addPage(PAGE);
  const ink = rgb(0.11, 0.13, 0.19);
  page.drawRectangle({ x: 24, y: 24, width: PAGE[0] - 48, height: PAGE[1] - 48, borderColor: ink, borderWidth: 1.5 });
  let y = PAGE[1] - 80;
  const centre = (text: string, size: number, f = font) => {
    const s = printable(text);
    page.drawText(s, { x: (PAGE[0] - f.widthOfTextAtSize(s, size)) / 2, y, size, font: f, color: ink });
    y -= size + 10;
  };
  const para = (text: string, size: number, max = PAGE[0] - 200) => {
    let line = "";
    const lines: string[] = [];
    for (const w of printable(text).split(" ")) {
      const next = line ? `${line} ${w}` : w;
      if (font.widthOfTextAtSize(next, size) > max && line) {
        lines.push(line);
        line = w;
      } else line = next;
    }
    if (line) lines.push(line);
    for (const l of lines) centre(l, size);
  };
  centre(input.schoolName, 22, bold);
  centre(`Pilot school certificate number: ${input.schoolCertificateNumber ?? "not recorded"}`, 11);
  y -= 14;
  centre("Graduation certificate", 30, bold);
  y -= 6;
  centre("This certifies that", 13);
  centre(input.graduateName, 26, bold);
  centre(`graduated from the course ${input.course} on ${formatDay(input.graduatedOn)}.`, 13);
  y -= 6;
  para(input.completionStatement, 12);
  y -= 10;
  para(input.certification.statement, 10.5);
  y -= 8;
  centre(
    `Certified by ${input.certification.name}, chief instructor, certificate number ${input.certification.certificateNumber ?? "none recorded"}, on ${formatDay(input.certification.certifiedOn)}.`,
    11,
    bold,
  );
  const foot = printable(`Certificate ${input.certificateId} - audit chain ${input.certification.auditHash}`);
  page.drawText(foot, { x: 40, y: 36, size: 7, font: mono, color: rgb(0.3, 0.33, 0.4) });
  return doc.save();
}
