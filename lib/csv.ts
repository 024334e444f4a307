import { parse } from "csv-parse/sync";
import { stringify } from "csv-stringify/sync";

/**
 * The one CSV module. Export neutralises cells that a spreadsheet would run as a formula
 * (leading =, +, -, @, tab or carriage return) by prefixing an apostrophe.
 */
export function neutraliseCell(value: unknown): string {
  if (value === null || value === undefined) return "";
  const s = value instanceof Date ? value.toISOString() : String(value);
  return /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
}

export function toCsv(header: readonly string[], rows: readonly (readonly unknown[])[]): string {
  return stringify([header.map(neutraliseCell), ...rows.map((r) => r.map(neutraliseCell))], { record_delimiter: "\r\n" });
}

/** Rows without a header, as `toCsv` writes them: a streamed export writes its header once, then batches. */
export function toCsvRows(rows: readonly (readonly unknown[])[]): string {
  return rows.length
    ? stringify(
        rows.map((r) => r.map(neutraliseCell)),
        { record_delimiter: "\r\n" },
      )
    : "";
}

export interface ParsedCsv {
  header: string[];
  rows: Record<string, string>[];
  delimiter: "," | ";";
}

/** Reads an uploaded CSV: strips a UTF-8 byte-order mark, detects `,` or `;`, honours quotes. */
export function parseCsv(input: string | Buffer): ParsedCsv {
  let text = typeof input === "string" ? input : input.toString("utf8");
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  const firstLine = text.split(/\r?\n/, 1)[0] ?? "";
  const delimiter = countOutsideQuotes(firstLine, ";") > countOutsideQuotes(firstLine, ",") ? ";" : ",";
  const records = parse(text, { delimiter, skip_empty_lines: true, relax_column_count: true, trim: true, bom: true }) as string[][];
  const header = (records[0] ?? []).map((h) => h.trim().toLowerCase());
  const rows = records.slice(1).map((r) => Object.fromEntries(header.map((h, i) => [h, r[i] ?? ""])));
  return { header, rows, delimiter };
}

function countOutsideQuotes(line: string, ch: string): number {
  let inQuotes = false;
  let n = 0;
  for (const c of line) {
    if (c === '"') inQuotes = !inQuotes;
    else if (c === ch && !inQuotes) n++;
  }
  return n;
}
