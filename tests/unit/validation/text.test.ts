import { z } from "zod";
import { findUnsafeText, safeText, stripBidiControls, textProblem } from "@/lib/validation/text";

describe("textProblem", () => {
  test("ordinary text, accents, emoji (a valid surrogate pair) and Arabic pass", () => {
    for (const s of ["Vmd and L/D", "Zoë Ørsted", "Well done \u{1F44D}", "مرحبا", ""]) expect(textProblem(s)).toBeNull();
  });
  test("NUL and lone surrogates are refused", () => {
    expect(textProblem("a\u0000b")).toBe("must not contain a NUL character");
    expect(textProblem("a\uD800b")).toBe("must not contain a broken character (lone surrogate)");
    expect(textProblem("a\uDC00")).toBe("must not contain a broken character (lone surrogate)");
    expect(textProblem("\uDBFF")).toBe("must not contain a broken character (lone surrogate)");
  });
});

describe("findUnsafeText", () => {
  test("names the path of the first bad string", () => {
    expect(findUnsafeText({ sessionId: "x", lines: [{ note: "ok" }, { note: "bad\u0000" }] })).toEqual({
      field: "lines.1.note",
      message: "must not contain a NUL character",
    });
    expect(findUnsafeText(["first", { room: "\uD83D" }])).toEqual({ field: "1.room", message: expect.stringContaining("lone surrogate") });
  });
  test("a clean value passes", () => {
    expect(findUnsafeText({ a: ["x", 1, null, true, { b: "y" }], when: new Date() })).toBeNull();
  });
  test("nesting deeper than 64 levels is refused without recursion", () => {
    let deep: unknown = [];
    for (let i = 0; i < 100_000; i++) deep = [deep];
    expect(findUnsafeText(deep)).toEqual({ field: expect.any(String), message: "nested more than 64 levels deep" });
  });
});

describe("stripBidiControls", () => {
  test("removes embeddings, overrides and isolates, keeps the rest", () => {
    expect(stripBidiControls("invoice\u202Efdp.exe")).toBe("invoicefdp.exe");
    expect(stripBidiControls("\u2066a\u2067b\u2068c\u2069\u202A\u202B\u202C\u202D")).toBe("abc");
    expect(stripBidiControls("Zoë مرحبا")).toBe("Zoë مرحبا");
  });
});

test("safeText in a schema names the field", () => {
  const r = z.object({ room: safeText() }).safeParse({ room: "A\u0000" });
  expect(r.success).toBe(false);
  expect(r.error!.issues[0]!.path).toEqual(["room"]);
});
