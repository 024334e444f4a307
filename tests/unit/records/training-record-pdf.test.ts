import { PDFDocument } from "pdf-lib";
import { inflateSync } from "node:zlib";
import { trainingRecordPdf, printable } from "@/lib/records/training-record-pdf";
import { CAUTION_TEXT } from "@/lib/caution";

const HEAD = "ab".repeat(32);

/** The text drawn on each page (content streams, inflated when compressed). */
async function pageTexts(bytes: Uint8Array): Promise<string[]> {
  const doc = await PDFDocument.load(bytes);
  return doc.getPages().map((p) => {
    const contents = p.node.Contents();
    const streams = contents && "asArray" in contents ? (contents as unknown as { asArray(): unknown[] }).asArray() : [contents];
    return streams
      .map((ref) => {
        const s = doc.context.lookup(ref as never) as unknown as { getContents(): Uint8Array; dict: { toString(): string } };
        const raw = Buffer.from(s.getContents());
        const hex = s.dict.toString().includes("FlateDecode") ? inflateSync(raw).toString("latin1") : raw.toString("latin1");
        // Helvetica text is written as hex strings <...> Tj
        return [...hex.matchAll(/<([0-9A-Fa-f]+)> Tj/g)].map((m) => Buffer.from(m[1]!, "hex").toString("latin1")).join("\n");
      })
      .join("\n");
  });
}

describe("the printable training record", () => {
  it("numbers its pages 'Page x of y' and prints the audit chain's head hash and the calculation caution on every page", async () => {
    const checks = Array.from({ length: 40 }, (_, i) => ({
      heading: `2026-11-${String((i % 28) + 1).padStart(2, "0")} · AER-0${(i % 5) + 1} · Meets the standard`,
      lines: ["1. [AER-01] Name the parts of zero-lift drag - Solid", "2. [AER-03] Vmd at 1,000 kg - Solid"],
    }));
    const bytes = await trainingRecordPdf({
      schoolName: "Larkhollow Flying School",
      studentName: "Zofia Wróbel",
      enrolment: ["Course: PPL-GS"],
      groundSummary: "Credited ground time: 3.5 of 35 h",
      groundLog: [["2026-11-20", "Drag and Vmd", "attended", "1.5 h"]],
      checks,
      signOffs: [["AER-01 Zero-lift drag", "2026-11-21", "Tomasz Varga", "LHV-GI-0142", "current", "0123456789abcdef"]],
      stageChecks: [],
      notYetDone: [["AER-02", "S1", "Induced drag"]],
      certification: { statement: "I certify this record.", name: "Imogen Farrant", certificateNumber: "LHV-GI-0007" },
      headHash: HEAD,
      headPosition: 42,
      generatedAt: "2026-12-02 10:00",
    });
    const texts = await pageTexts(bytes);
    expect(texts.length).toBeGreaterThan(1);
    texts.forEach((t, i) => {
      expect(t).toContain(`Page ${i + 1} of ${texts.length}`);
      expect(t).toContain(HEAD);
      // the caution is wrapped over lines; its words all appear on each page
      expect(t.replace(/\s+/g, " ")).toContain(printable(CAUTION_TEXT).replace(/\s+/g, " ").slice(0, 60));
    });
    const all = texts.join("\n");
    expect(all).toContain("LHV-GI-0142");
    expect(all).toContain("Certificate number: LHV-GI-0007");
    expect(all).toContain("Syllabus items not yet done");
    expect(texts[0]).toContain("Training record: Zofia Wrobel");
  });

  it("replaces what the standard font cannot print instead of failing", () => {
    expect(printable("Łukasz – “quoted” ≥ 3")).toBe('?ukasz - "quoted" ? 3');
  });
});
