import { pagedDocument } from "@/lib/pdf/paged";
import type { PackDocument } from "./document";
import { RECORD_HASH_BASIS } from "./content";

// The inspection pack as one PDF in the house layout (lib/pdf/paged.ts): the calculation caution,
// "Page x of y", the record hash and the time it was made on every page.

export interface PackPdfInput {
  doc: PackDocument;
  /** SHA-256 over `doc` (recordHash in ./content.ts) */
  recordHash: string;
  /** when the pack was made, as printed in the school's time zone */
  madeAt: string;
  timeZone: string;
  /** who made it */
  madeBy: string;
}

export async function inspectionPackPdf(input: PackPdfInput): Promise<Uint8Array> {
  const { doc } = input;
  const pdf = await pagedDocument(doc.title);
  const { write, heading, table, skip, bold, mono } = pdf;

  write(doc.schoolName, { f: bold, size: 10 });
  write(doc.title, { f: bold, size: 18, gap: 4 });
  write(`Made on ${input.madeAt} (${input.timeZone}) by ${input.madeBy}.`);
  write(`Record hash (SHA-256): ${input.recordHash}`, { f: mono, size: 7.5 });
  write(RECORD_HASH_BASIS, { size: 8, gap: 4 });
  write(`Contents: ${doc.sections.map((s, i) => `${i + 1}. ${s.heading}`).join("; ")}.`, { size: 8.5 });

  doc.sections.forEach((s, i) => {
    heading(`${i + 1}. ${s.heading}`);
    for (const b of s.blocks) {
      if (b.kind === "table") table(b.header, b.rows, b.widths);
      else write(b.text, { f: b.mono ? mono : b.bold ? bold : undefined, size: b.mono ? 7.5 : 9, indent: b.indent ? 12 : 0 });
    }
    skip(4);
  });

  return pdf.finish(() => `Record hash ${input.recordHash} · made ${input.madeAt}`);
}
