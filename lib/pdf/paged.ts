import { PDFDocument, StandardFonts, rgb, type PDFFont, type PDFPage } from "pdf-lib";
import { CAUTION_TEXT } from "@/lib/caution";

// The house layout of Chalkwing's printed records (pdf-lib, pure JS, no browser): A4 pages of
// wrapped text, headings and tables; every page carries the calculation caution, a footer line and
// "Page x of y". Used by the training record and the inspection pack.

export const A4: [number, number] = [595.28, 841.89];
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

export interface WriteOptions {
  f?: PDFFont;
  size?: number;
  indent?: number;
  gap?: number;
}

export interface PagedDocument {
  doc: PDFDocument;
  font: PDFFont;
  bold: PDFFont;
  mono: PDFFont;
  /** the width between the margins */
  width: number;
  wrap(text: string, f: PDFFont, size: number, max: number): string[];
  /** wrapped text, flowing onto a new page when the page is full */
  write(text: string, opts?: WriteOptions): void;
  heading(text: string): void;
  /** a table; `widths` are shares of the width; "None." when there are no rows */
  table(header: string[], rows: string[][], widths: number[]): void;
  /** starts a new page unless `points` of height are left above the footer */
  keepTogether(points: number): void;
  /** moves down by `points` */
  skip(points: number): void;
  /**
   * Draws the caution, the footer line (given the page's index) and "Page x of y" on every page,
   * then returns the PDF's bytes. Call once, after all the content.
   */
  finish(footer: (pageIndex: number, pageCount: number) => string): Promise<Uint8Array>;
}

export async function pagedDocument(title: string): Promise<PagedDocument> {
  const doc = await PDFDocument.create();
  doc.setTitle(printable(title));
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
  const write = (text: string, opts: WriteOptions = {}) => {
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
  const keepTogether = (points: number) => {
    if (y < MARGIN + FOOT + points) newPage();
  };
  const heading = (text: string) => {
    keepTogether(60);
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
  const finish = async (footer: (pageIndex: number, pageCount: number) => string) => {
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
      p.drawText(printable(footer(i, pages.length)), { x: MARGIN, y: 26, size: 6.5, font: mono, color: rgb(0.3, 0.33, 0.4) });
      const label = `Page ${i + 1} of ${pages.length}`;
      p.drawText(label, { x: A4[0] - MARGIN - font.widthOfTextAtSize(label, 8), y: 26, size: 8, font });
    });
    return doc.save();
  };
  return {
    doc,
    font,
    bold,
    mono,
    width,
    wrap,
    write,
    heading,
    table,
    keepTogether,
    skip: (points: number) => {
      y -= points;
    },
    finish,
  };
}
