/** @jest-environment node */
// "Every screen showing calculations carries the caution component" (DEVELOPERS.md, Rules of the
// house; README "Caution"). The screens that show calculations are listed here, each checked to
// render <Caution /> (in the page or in a component it imports); and a screen whose own UI code
// (the page and what it imports from app/ and components/) uses the calculation library
// (lib/aero, DEVELOPERS.md "A calculation") or the curve charts must be on the list, so a new
// calculating screen cannot go without it. Imports are read from the source text.
import { existsSync, readFileSync, readdirSync, statSync } from "node:fs";
import path from "node:path";

const ROOT = path.resolve(__dirname, "../../..");
const CAUTION = path.join(ROOT, "components/caution.tsx");
const UI = [path.join(ROOT, "app") + path.sep, path.join(ROOT, "components") + path.sep];
const CALCULATION_CODE = [path.join(ROOT, "lib/aero") + path.sep, path.join(ROOT, "components/charts") + path.sep];

/** The screens that show calculations: curves and figures from lib/aero, computed answers, hours and rates. */
const CALCULATING = [
  "app/(app)/curve-lab/page.tsx",
  "app/(app)/curve-lab/airframes/page.tsx",
  "app/(app)/curve-lab/airframes/new/page.tsx",
  "app/(app)/curve-lab/airframes/[airframeId]/page.tsx",
  "app/(app)/curve-lab/airframes/[airframeId]/edit/page.tsx",
  "app/(app)/curve-lab/demos/new/page.tsx",
  "app/(app)/curve-lab/demos/[demoId]/page.tsx",
  "app/(app)/curve-lab/demos/[demoId]/projector/page.tsx",
  "app/(app)/practice/page.tsx",
  "app/(app)/records/[studentId]/page.tsx",
  "app/(app)/progress/[studentId]/page.tsx",
  "app/(app)/endorsements/pass-rate/page.tsx",
];

function pages(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    if (statSync(full).isDirectory()) return pages(full);
    return name === "page.tsx" ? [full] : [];
  });
}

function resolve(spec: string, from: string): string | null {
  let base: string;
  if (spec.startsWith("@/")) base = path.join(ROOT, spec.slice(2));
  else if (spec.startsWith(".")) base = path.resolve(path.dirname(from), spec);
  else return null; // a package
  for (const candidate of [base, `${base}.ts`, `${base}.tsx`, path.join(base, "index.ts"), path.join(base, "index.tsx")]) {
    if (existsSync(candidate) && statSync(candidate).isFile()) return candidate;
  }
  return null;
}

const IMPORT =
  /(?:import|export)\s[^'"`;]*?from\s*["']([^"']+)["']|import\s*\(\s*["']([^"']+)["']\s*\)|require\s*\(\s*["']([^"']+)["']\s*\)|import\s+["']([^"']+)["']/g;
const importsCache = new Map<string, string[]>();
function importsOf(file: string): string[] {
  let out = importsCache.get(file);
  if (!out) {
    const text = readFileSync(file, "utf8");
    out = [...text.matchAll(IMPORT)].map((m) => resolve(m[1] ?? m[2] ?? m[3] ?? m[4]!, file)).filter((f): f is string => f !== null);
    importsCache.set(file, out);
  }
  return out;
}

/** The page and every file of app/ and components/ it reaches through imports, with what those import. */
function uiOf(page: string): { ui: string[]; imported: string[] } {
  const seen = new Set<string>([page]);
  const imported = new Set<string>();
  const todo = [page];
  while (todo.length) {
    for (const next of importsOf(todo.pop()!)) {
      imported.add(next);
      if (!seen.has(next) && UI.some((dir) => next.startsWith(dir))) {
        seen.add(next);
        todo.push(next);
      }
    }
  }
  return { ui: [...seen], imported: [...imported] };
}

/** A file that renders the caution (the component's own module aside). */
const rendersCaution = (file: string) => file !== CAUTION && /<Caution\b/.test(readFileSync(file, "utf8"));

const all = pages(path.join(ROOT, "app")).map((page) => {
  const { ui, imported } = uiOf(page);
  return {
    page: path.relative(ROOT, page),
    usesCalculations: imported.some((f) => CALCULATION_CODE.some((dir) => f.startsWith(dir))),
    caution: ui.some(rendersCaution),
  };
});

describe("the calculation caution", () => {
  it.each(CALCULATING)("%s shows calculations and carries the caution", (page) => {
    const found = all.find((p) => p.page === page);
    expect(found).toBeDefined();
    expect(found!.caution).toBe(true);
  });

  it("every screen whose own code draws on the calculation library is listed as showing calculations", () => {
    const drawing = all.filter((p) => p.usesCalculations).map((p) => p.page);
    // the Curve Lab's screens at least: the reading of imports finds them
    expect(drawing).toEqual(
      expect.arrayContaining(["app/(app)/curve-lab/demos/[demoId]/page.tsx", "app/(app)/curve-lab/airframes/[airframeId]/page.tsx"]),
    );
    expect(drawing.filter((p) => !CALCULATING.includes(p))).toEqual([]);
  });
});
