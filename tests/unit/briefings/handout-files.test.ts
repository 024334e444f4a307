import { contentDisposition, sniffHandoutType, baseName } from "@/app/api/handouts/_lib/files";

const bytes = (...b: number[]) => new Uint8Array(b);
const ascii = (s: string) => new Uint8Array([...s].map((c) => c.charCodeAt(0)));

/** The two parameters of a header we built: the quoted fallback and the RFC 5987 value, decoded. */
function parse(header: string) {
  const m = /^attachment; filename="([^"\\]*)"; filename\*=UTF-8''([A-Za-z0-9!#$&+\-.^_`|~%]+)$/.exec(header);
  if (!m) throw new Error(`not the expected shape: ${header}`);
  return { fallback: m[1]!, utf8: decodeURIComponent(m[2]!) };
}

describe("handout type from content", () => {
  it("recognises the three signatures and nothing else", () => {
    expect(sniffHandoutType(ascii("%PDF-1.7\n"))).toBe("application/pdf"); // ISO 32000-1, 7.5.2 file header
    expect(sniffHandoutType(bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13))).toBe("image/png"); // RFC 2083, 3.1
    expect(sniffHandoutType(bytes(0xff, 0xd8, 0xff, 0xe0, 0, 16))).toBe("image/jpeg"); // ITU T.81 SOI + APP0
    expect(sniffHandoutType(ascii("GIF89a"))).toBeNull();
    expect(sniffHandoutType(ascii("<html><body>%PDF-"))).toBeNull();
    expect(sniffHandoutType(bytes(0x89, 0x50, 0x4e, 0x47))).toBeNull(); // a truncated PNG signature
    expect(sniffHandoutType(bytes())).toBeNull();
  });
});

describe("download names", () => {
  it("keeps an ordinary name as it is", () => {
    expect(contentDisposition("drag-curve.pdf", "application/pdf")).toBe(
      `attachment; filename="drag-curve.pdf"; filename*=UTF-8''drag-curve.pdf`,
    );
  });

  it.each([
    ["path traversal", "../../etc/passwd.pdf", "passwd.pdf", "passwd.pdf"],
    ["Windows path", "C:\\Users\\x\\notes.pdf", "notes.pdf", "notes.pdf"],
    ["CR LF header injection", "a.pdf\r\nSet-Cookie: x=1", "a.pdfSet-Cookie_ x_1.pdf", "a.pdfSet-Cookie: x=1.pdf"],
    ["quotes", 'say "hi".pdf', "say _hi_.pdf", 'say "hi".pdf'],
    ["non-ASCII", "Überziehgeschwindigkeit – Vmd.pdf", "Uberziehgeschwindigkeit _ Vmd.pdf", "Überziehgeschwindigkeit – Vmd.pdf"],
    ["only dots", "....", "handout.pdf", "handout.pdf"],
  ])("%s", (_label, stored, fallback, utf8) => {
    const header = contentDisposition(stored, "application/pdf");
    expect(header).not.toMatch(/[\r\n]/);
    expect(/^[\x20-\x7e]+$/.test(header)).toBe(true);
    expect(parse(header)).toEqual({ fallback, utf8 });
    expect(parse(header).utf8).not.toMatch(/[\\/]|\.\./);
  });

  it("gives the name the extension of the real type", () => {
    expect(parse(contentDisposition("diagram", "image/png"))).toEqual({ fallback: "diagram.png", utf8: "diagram.png" });
    expect(parse(contentDisposition("photo.jpeg", "image/jpeg")).utf8).toBe("photo.jpeg");
    expect(parse(contentDisposition("report.html", "application/pdf")).utf8).toBe("report.html.pdf");
  });

  it("strips control characters and leading dots from the base name", () => {
    expect(baseName(".hidden\u0000.pdf")).toBe("hidden.pdf");
    expect(baseName("dir/\t")).toBe("handout");
  });
});
