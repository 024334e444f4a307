import { z } from "zod";

// Text from outside that no field may hold: NUL (PostgreSQL refuses it in text columns, so it
// would surface as a 500) and lone UTF-16 surrogates (not characters at all; they cannot be
// stored or mailed as UTF-8). Bidirectional control characters are allowed in what people type
// (a name may need them) but are stripped from everything that reaches mail, where they can
// make a link or a sentence read differently from what it is.

const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
const NUL = /\u0000/;
const BIDI_CONTROLS = /[\u202A-\u202E\u2066-\u2069]/g;

/** Why this string may not be stored, or null. */
export function textProblem(s: string): string | null {
  if (NUL.test(s)) return "must not contain a NUL character";
  if (LONE_SURROGATE.test(s)) return "must not contain a broken character (lone surrogate)";
  return null;
}

/** Removes U+202A–U+202E and U+2066–U+2069 (embeddings, overrides and isolates). */
export function stripBidiControls(s: string): string {
  return s.replace(BIDI_CONTROLS, "");
}

const MAX_DEPTH = 64;

/**
 * Walks any parsed input (JSON body, action arguments, query) and returns the first string,
 * key included, that `textProblem` refuses, with its path (`lines.0.note`). Iterative, so a
 * deeply nested value cannot overflow the stack; nesting deeper than 64 levels is itself refused.
 */
export function findUnsafeText(value: unknown): { field: string; message: string } | null {
  const stack: { v: unknown; path: string[]; depth: number }[] = [{ v: value, path: [], depth: 0 }];
  const field = (path: string[]) => path.join(".") || "body";
  while (stack.length > 0) {
    const { v, path, depth } = stack.pop()!;
    if (typeof v === "string") {
      const problem = textProblem(v);
      if (problem) return { field: field(path), message: problem };
      continue;
    }
    if (v === null || typeof v !== "object") continue;
    if (depth >= MAX_DEPTH) return { field: field(path), message: `nested more than ${MAX_DEPTH} levels deep` };
    if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) stack.push({ v: v[i], path: [...path, String(i)], depth: depth + 1 });
      continue;
    }
    if (v instanceof Date || v instanceof Blob || ArrayBuffer.isView(v)) continue;
    const entries = v instanceof FormData ? [...v.entries()] : Object.entries(v as Record<string, unknown>);
    for (let i = entries.length - 1; i >= 0; i--) {
      const [k, child] = entries[i]!;
      const keyProblem = textProblem(k);
      if (keyProblem) return { field: field(path), message: keyProblem };
      stack.push({ v: child, path: [...path, k], depth: depth + 1 });
    }
  }
  return null;
}

/** A zod string that refuses NUL and lone surrogates (for schemas that want it explicitly). */
export function safeText() {
  return z.string().superRefine((s, ctx) => {
    const problem = textProblem(s);
    if (problem) ctx.addIssue({ code: "custom", message: problem });
  });
}
