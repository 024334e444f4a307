/**
 * @jest-environment node
 */
// Downloads: a stored upload (handout, transfer evidence) is answered as an attachment that the
// browser neither sniffs nor runs, and download names made from a person's name keep only safe
// characters (training record, inspection pack, logbook CSV).
import { fileAttachment } from "@/app/api/handouts/_lib/files";
import { fileNamePart } from "@/lib/http/download";

describe("a stored upload as an attachment", () => {
  it("sends the bytes with their type and length, as an attachment, never sniffed, sandboxed, not cached", async () => {
    const content = Buffer.from("%PDF-1.4\n%%EOF\n");
    const res = fileAttachment({ content, contentType: "application/pdf", fileName: "../Notes\r\n.pdf" });
    expect(res.status).toBe(200);
    expect(Buffer.from(await res.arrayBuffer()).equals(content)).toBe(true);
    expect(Object.fromEntries(res.headers)).toEqual({
      "content-type": "application/pdf",
      "content-length": String(content.length),
      "content-disposition": `attachment; filename="Notes.pdf"; filename*=UTF-8''Notes.pdf`,
      "x-content-type-options": "nosniff",
      "content-security-policy": "sandbox; default-src 'none'",
      "referrer-policy": "no-referrer",
      "cache-control": "private, no-store",
    });
  });
});

describe("a person's name in a download name", () => {
  it.each([
    ["Ines Varga", "ines-varga"],
    ["  O'Brien-Smith, Jr. ", "o-brien-smith-jr"],
    ["Inès Varga", "in-s-varga"],
    ["李雷", "student"],
    ["", "student"],
  ])("%j → %j", (name, part) => {
    expect(fileNamePart(name)).toBe(part);
  });
});
