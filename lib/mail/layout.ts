import { formatDay, formatDayTime, formatTime } from "@/lib/time";
import { stripBidiControls } from "@/lib/validation/text";

/**
 * Chalkwing's own mail layout: one centred table, inline styles only, no images, no
 * external CSS, so that old and new mail clients render it alike. Everything a person
 * typed passes through `esc` before it reaches HTML.
 */

export interface MailSchool {
  name: string;
  timeZone: string;
  senderName?: string;
}

export interface ComposedMail {
  subject: string;
  text: string;
  html: string;
  headers?: Record<string, string>;
}

export function esc(value: unknown): string {
  return String(value ?? "")
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

/** Header values must stay on one line: CR/LF in a name would otherwise inject headers. */
export function oneLine(value: string): string {
  return stripBidiControls(value)
    .replace(/[\r\n\t]+/g, " ")
    .replace(/\s{2,}/g, " ")
    .trim();
}

/** The first name, for a greeting: "Imogen Farrant" → "Imogen". */
export function firstName(fullName: string): string {
  return fullName.trim().split(/\s+/)[0] || fullName;
}

/** Every mail greets its recipient by first name. */
export function greet(fullName: string): string {
  return `Hello ${firstName(fullName)},`;
}

// Mail uses the one date style of lib/time.ts ("Thu 3 Dec 2026, 09:00"), in the school's zone.
export function whenLong(instant: Date, timeZone: string): string {
  return formatDayTime(instant, timeZone);
}

export function whenShort(instant: Date, timeZone: string): string {
  return formatDayTime(instant, timeZone);
}

export function timeOnly(instant: Date, timeZone: string): string {
  return formatTime(instant, timeZone);
}

/** "2026-12-09" → "Wed 9 Dec 2026" (a calendar date, no time zone shift). */
export function dateLong(isoDate: string): string {
  return formatDay(isoDate);
}

export const COLOURS = {
  ink: "#1c2230",
  soft: "#414a5c",
  faint: "#5f6878",
  paper: "#fbf8f1",
  edge: "#e2dac6",
  board: "#152033",
  chalk: "#f4f1e8",
  wing: "#235a8a",
  solid: "#2e7d3a",
  shaky: "#a86a05",
  notyet: "#b8324f",
};

/** A block of the mail body: HTML (already escaped by the caller) and its plain-text twin. */
export interface Block {
  html: string;
  text: string;
}

export function para(text: string): Block {
  return { html: `<p style="margin:0 0 14px 0;font-size:15px;line-height:22px;color:${COLOURS.ink};">${esc(text)}</p>`, text };
}

export function heading(text: string): Block {
  return {
    html: `<h2 style="margin:18px 0 8px 0;font-size:17px;line-height:24px;color:${COLOURS.ink};font-weight:bold;">${esc(text)}</h2>`,
    text: `${text}\n${"-".repeat(Math.min(text.length, 60))}`,
  };
}

/** Label/value rows, e.g. When / Where / Instructor. */
export function facts(rows: [string, string][]): Block {
  const trs = rows
    .map(
      ([k, v]) =>
        `<tr><th scope="row" align="left" valign="top" style="padding:4px 12px 4px 0;font-size:14px;line-height:20px;color:${COLOURS.faint};font-weight:normal;white-space:nowrap;">${esc(k)}</th>` +
        `<td valign="top" style="padding:4px 0;font-size:14px;line-height:20px;color:${COLOURS.ink};">${esc(v)}</td></tr>`,
    )
    .join("");
  return {
    html: `<table role="presentation" cellpadding="0" cellspacing="0" border="0" style="margin:0 0 14px 0;border-collapse:collapse;">${trs}</table>`,
    text: rows.map(([k, v]) => `${k}: ${v}`).join("\n"),
  };
}

export function bullets(items: string[]): Block {
  if (items.length === 0) return { html: "", text: "" };
  return {
    html: `<ul style="margin:0 0 14px 0;padding-left:20px;color:${COLOURS.ink};font-size:14px;line-height:21px;">${items.map((i) => `<li style="margin:0 0 4px 0;">${esc(i)}</li>`).join("")}</ul>`,
    text: items.map((i) => `- ${i}`).join("\n"),
  };
}

/** A button-like link that is still a plain link in every client; the text part prints the URL. */
export function action(label: string, url: string): Block {
  return {
    html:
      `<table role="presentation" cellpadding="0" cellspacing="0" border="0" style="margin:4px 0 18px 0;"><tr>` +
      `<td bgcolor="${COLOURS.wing}" style="border-radius:6px;background-color:${COLOURS.wing};">` +
      `<a href="${esc(url)}" style="display:inline-block;padding:12px 20px;font-size:15px;line-height:20px;color:#ffffff;text-decoration:none;font-weight:bold;">${esc(label)}</a>` +
      `</td></tr></table>`,
    text: `${label}: ${url}`,
  };
}

/** Assembles the full HTML document and the plain-text part. */
export function render(opts: { school: MailSchool; title: string; greeting: string; blocks: Block[]; footer?: Block[] }): {
  html: string;
  text: string;
} {
  const { school, title, greeting, blocks } = opts;
  const footer = opts.footer ?? [];
  const bodyHtml = blocks.map((b) => b.html).join("\n");
  const footHtml = footer.map((b) => b.html).join("\n");
  const html = `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)}</title>
</head>
<body style="margin:0;padding:0;background-color:${COLOURS.paper};">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" border="0" bgcolor="${COLOURS.paper}" style="background-color:${COLOURS.paper};">
<tr><td align="center" style="padding:20px 10px;">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" border="0" style="max-width:600px;border-collapse:collapse;font-family:Arial,Helvetica,sans-serif;">
<tr><td bgcolor="${COLOURS.board}" style="background-color:${COLOURS.board};padding:16px 24px;border-radius:8px 8px 0 0;">
<p style="margin:0;font-size:13px;line-height:18px;color:${COLOURS.chalk};letter-spacing:0.04em;">${esc(school.name)}</p>
<h1 style="margin:4px 0 0 0;font-size:20px;line-height:26px;color:#ffffff;font-weight:bold;">${esc(title)}</h1>
</td></tr>
<tr><td bgcolor="#ffffff" style="background-color:#ffffff;padding:22px 24px;border:1px solid ${COLOURS.edge};border-top:0;">
<p style="margin:0 0 14px 0;font-size:15px;line-height:22px;color:${COLOURS.ink};">${esc(greeting)}</p>
${bodyHtml}
</td></tr>
<tr><td style="padding:14px 24px;font-size:12px;line-height:18px;color:${COLOURS.faint};">
${footHtml}
<p style="margin:0;font-size:12px;line-height:18px;color:${COLOURS.faint};">Sent by ${esc(school.name)} ground school through Chalkwing.</p>
</td></tr>
</table>
</td></tr>
</table>
</body>
</html>`;
  const parts = [school.name, "", title, "=".repeat(Math.min(title.length, 60)), "", greeting, ""];
  for (const b of blocks) if (b.text) parts.push(b.text, "");
  parts.push("--");
  for (const b of footer) if (b.text) parts.push(b.text);
  parts.push(`Sent by ${school.name} ground school through Chalkwing.`);
  // bidirectional controls from any name or note never reach a mail (lib/validation/text.ts)
  return { html: stripBidiControls(html), text: stripBidiControls(parts.join("\n") + "\n") };
}
