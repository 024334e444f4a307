import type { HandoutContentType } from "@/db/access/briefings/handouts";

// Handout files: what the bytes are (from their first bytes, never from the name), and a
// download name that is safe in a Content-Disposition header.

/** The type the content really is, from its signature (magic bytes), or null for anything else. */
export function sniffHandoutType(head: Uint8Array): HandoutContentType | null {
  const starts = (sig: number[]) => sig.every((b, i) => head[i] === b);
  if (starts([0x25, 0x50, 0x44, 0x46, 0x2d])) return "application/pdf"; // "%PDF-" (ISO 32000-1, 7.5.2)
  if (starts([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return "image/png"; // PNG signature (RFC 2083, 3.1)
  if (starts([0xff, 0xd8, 0xff])) return "image/jpeg"; // SOI marker then the next marker (ITU T.81, B.1.1.3)
  return null;
}

export const EXTENSIONS: Record<HandoutContentType, string[]> = {
  "application/pdf": [".pdf"],
  "image/png": [".png"],
  "image/jpeg": [".jpg", ".jpeg"],
};

/** The declared media type without parameters, lower case ("image/PNG; x=y" → "image/png"). */
export function mediaType(header: string | null): string {
  return (header ?? "").split(";")[0]!.trim().toLowerCase();
}

/** The file name's extension, lower case with its dot, or "" when it has none. */
export function extensionOf(name: string): string {
  const m = /\.([A-Za-z0-9]{1,8})$/.exec(name.trim());
  return m ? `.${m[1]!.toLowerCase()}` : "";
}

/** The last path segment of an uploaded name with control characters removed; never empty. */
export function baseName(name: string): string {
  const cleaned = name.replace(/[\u0000-\u001f\u007f]/g, "");
  const last = cleaned.split(/[\\/]/).pop() ?? "";
  const trimmed = last.replace(/^[.\s]+/, "").trim();
  return trimmed || "handout";
}

function rfc5987(value: string): string {
  // attr-char (RFC 5987, 3.2.1) leaves only ALPHA / DIGIT / "!#$&+-.^_`|~" unencoded
  return encodeURIComponent(value).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
}

/**
 * `attachment; filename="<ASCII fallback>"; filename*=UTF-8''<percent-encoded>` (RFC 6266, 4.3):
 * no path, no CR/LF, no quotes or backslashes in the quoted form, and an extension that matches
 * the file's real type.
 */
export function contentDisposition(storedName: string, type: HandoutContentType): string {
  let name = baseName(storedName);
  if (!EXTENSIONS[type].includes(extensionOf(name))) name = `${name}${EXTENSIONS[type][0]}`;
  const ascii =
    name
      .normalize("NFKD")
      .replace(/[\u0300-\u036f]/g, "")
      .replace(/[^A-Za-z0-9._ -]/g, "_")
      .replace(/_+/g, "_")
      .slice(-150) || `handout${EXTENSIONS[type][0]}`;
  return `attachment; filename="${ascii}"; filename*=UTF-8''${rfc5987(name)}`;
}

/**
 * A stored upload (a handout, a transfer credit's evidence) sent back as an attachment: its own type
 * and length, never sniffed or run by the browser (nosniff, a sandboxing CSP), not cached.
 */
export function fileAttachment(file: { content: Buffer; contentType: HandoutContentType; fileName: string }): Response {
  return new Response(new Uint8Array(file.content), {
    status: 200,
    headers: {
      "Content-Type": file.contentType,
      "Content-Length": String(file.content.length),
      "Content-Disposition": contentDisposition(file.fileName, file.contentType),
      "X-Content-Type-Options": "nosniff",
      "Content-Security-Policy": "sandbox; default-src 'none'",
      "Referrer-Policy": "no-referrer",
      "Cache-Control": "private, no-store",
    },
  });
}
