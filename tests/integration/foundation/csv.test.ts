// lib/csv.ts, the one CSV module. Quoting follows RFC 4180 (fields with commas, quotes or line
// breaks are enclosed in double quotes; a quote inside is doubled). Formula neutralising follows
// OWASP's "CSV Injection" guidance (cells starting with =, +, -, @, tab or carriage return are
// prefixed with an apostrophe).
import { parse } from "csv-parse/sync";
import { parseCsv, toCsv, neutraliseCell } from "@/lib/csv";

describe("reading uploads", () => {
  test("a UTF-8 byte-order mark is stripped from the first header", () => {
    const r = parseCsv("\uFEFFname,email\r\nAda Quill,ada@chalkwing.test\r\n");
    expect(r.header).toEqual(["name", "email"]);
    expect(r.rows).toEqual([{ name: "Ada Quill", email: "ada@chalkwing.test" }]);
  });

  test("a BOM given as bytes is stripped too", () => {
    const r = parseCsv(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from("name;email\nAda;a@chalkwing.test\n")]));
    expect(r.header).toEqual(["name", "email"]);
  });

  test("a `;` delimiter (spreadsheets in comma-decimal locales) is detected", () => {
    const r = parseCsv("name;email;hours\nNoor Brandt;noor@chalkwing.test;12,5\n");
    expect(r.delimiter).toBe(";");
    expect(r.rows[0]).toEqual({ name: "Noor Brandt", email: "noor@chalkwing.test", hours: "12,5" });
  });

  test("quoted commas stay inside their field and do not sway the delimiter", () => {
    const r = parseCsv('name,note\n"Quill, Ada","says ""hello"", twice"\n');
    expect(r.delimiter).toBe(",");
    expect(r.rows[0]).toEqual({ name: "Quill, Ada", note: 'says "hello", twice' });
  });

  test("semicolons inside quotes do not make a `;` file", () => {
    const r = parseCsv('name,note\n"Ada","a; b; c; d"\n');
    expect(r.delimiter).toBe(",");
    expect(r.rows[0]?.note).toBe("a; b; c; d");
  });
});

describe("writing exports", () => {
  test.each([
    ["=SUM(A1:A2)", "'=SUM(A1:A2)"],
    ["+44 20 7946 0000", "'+44 20 7946 0000"],
    ["-2+3", "'-2+3"],
    ["@cmd", "'@cmd"],
    ["\tlead", "'\tlead"],
    ["plain", "plain"],
    ["a=b", "a=b"],
  ])("cell %j is written as %j", (input, out) => {
    expect(neutraliseCell(input)).toBe(out);
  });

  test("null and undefined become empty cells; dates are ISO instants", () => {
    expect(neutraliseCell(null)).toBe("");
    expect(neutraliseCell(undefined)).toBe("");
    expect(neutraliseCell(new Date("2026-11-02T09:00:00Z"))).toBe("2026-11-02T09:00:00.000Z");
  });

  test("an export reads back cell for cell (RFC 4180 quoting), with formulas neutralised and CRLF line ends", () => {
    const csv = toCsv(
      ["name", "note"],
      [
        ["Quill, Ada", 'says "hi"'],
        ['=HYPERLINK("x")', "line\nbreak"],
      ],
    );
    expect(csv.endsWith("\r\n")).toBe(true);
    expect(csv.split("\r\n")[1]).toBe('"Quill, Ada","says ""hi"""');
    const back = parse(csv) as string[][];
    expect(back).toEqual([
      ["name", "note"],
      ["Quill, Ada", 'says "hi"'],
      ['\'=HYPERLINK("x")', "line\nbreak"],
    ]);
  });

  test("numbers that start with a minus are neutralised too (OWASP: any leading -)", () => {
    expect(toCsv(["n"], [[-5]]).split("\r\n")[1]).toBe("'-5");
  });
});
