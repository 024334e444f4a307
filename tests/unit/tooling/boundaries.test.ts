/** @jest-environment node */
// The layer boundaries of DEVELOPERS.md are enforced by eslint.config.mjs: each case lints a small
// snippet as if it lived at `filePath` and expects the boundary rule to fire, or to stay quiet.
import { execFileSync } from "node:child_process";
import path from "node:path";

type Case = { name: string; filePath: string; code: string; forbidden: boolean };

const BOUNDARY_RULES = new Set(["no-restricted-imports", "no-restricted-syntax"]);

const cases: Case[] = [
  // app/ and components/: no driver, no models; app/ reaches the database through db/access only
  {
    name: "app page imports sequelize",
    filePath: "app/(app)/x/page.tsx",
    code: `import { QueryTypes } from "sequelize";`,
    forbidden: true,
  },
  { name: "app route imports pg", filePath: "app/api/x/route.ts", code: `import { Client } from "pg";`, forbidden: true },
  { name: "app imports a model", filePath: "app/(app)/x/page.tsx", code: `import { Person } from "@/db/models";`, forbidden: true },
  {
    name: "app imports one model file",
    filePath: "app/(app)/x/page.tsx",
    code: `import type { T } from "@/db/models/briefing";`,
    forbidden: true,
  },
  {
    name: "app imports the sequelize instance",
    filePath: "app/api/x/route.ts",
    code: `import { sequelize } from "@/db/index";`,
    forbidden: true,
  },
  {
    name: "app imports db by a relative path",
    filePath: "app/api/x/route.ts",
    code: `import { sequelize } from "../../../db";`,
    forbidden: true,
  },
  {
    name: "app loads sequelize with import()",
    filePath: "app/api/x/route.ts",
    code: `export const load = () => import("sequelize");`,
    forbidden: true,
  },
  { name: "app loads pg with require()", filePath: "app/api/x/route.ts", code: `export const pg = require("pg");`, forbidden: true },
  {
    name: "app imports db/access",
    filePath: "app/(app)/x/page.tsx",
    code: `import { getSchool } from "@/db/access/shared/school";`,
    forbidden: false,
  },
  {
    name: "app imports a component",
    filePath: "app/(app)/x/page.tsx",
    code: `import { Caution } from "@/components/caution";`,
    forbidden: false,
  },
  { name: "component imports a model", filePath: "components/x.tsx", code: `import { Person } from "@/db/models";`, forbidden: true },
  {
    name: "component imports db/access",
    filePath: "components/x.tsx",
    code: `import { getSchool } from "@/db/access/shared/school";`,
    forbidden: true,
  },
  { name: "component imports sequelize", filePath: "components/ui/x.tsx", code: `import { Op } from "sequelize";`, forbidden: true },
  {
    name: "component imports lib",
    filePath: "components/x.tsx",
    code: `import { z } from "zod";\nimport { can } from "@/lib/auth/guard";`,
    forbidden: false,
  },
  // lib/: no driver outside the pg-boss plumbing, no components
  { name: "lib imports sequelize", filePath: "lib/records/x.ts", code: `import { QueryTypes } from "sequelize";`, forbidden: true },
  {
    name: "lib imports a component",
    filePath: "lib/records/x.ts",
    code: `import { Caution } from "@/components/caution";`,
    forbidden: true,
  },
  {
    name: "lib imports db/access",
    filePath: "lib/mail/x.ts",
    code: `import { getSchool } from "@/db/access/shared/school";`,
    forbidden: false,
  },
  { name: "mail queue imports pg-boss", filePath: "lib/mail/queue.ts", code: `import PgBoss from "pg-boss";`, forbidden: false },
  { name: "other lib file imports pg-boss", filePath: "lib/mail/x.ts", code: `import PgBoss from "pg-boss";`, forbidden: true },
  { name: "mail queue imports pg", filePath: "lib/mail/queue.ts", code: `import { Client } from "pg";`, forbidden: true },
  // lib/aero: itself and zod only; its bench may also drive a browser
  {
    name: "aero imports zod and itself",
    filePath: "lib/aero/x.ts",
    code: `import { z } from "zod";\nimport { ktToMs } from "./units";`,
    forbidden: false,
  },
  { name: "aero imports lib outside itself", filePath: "lib/aero/x.ts", code: `import { now } from "../clock";`, forbidden: true },
  { name: "aero imports by alias", filePath: "lib/aero/x.ts", code: `import { now } from "@/lib/clock";`, forbidden: true },
  { name: "aero imports a package", filePath: "lib/aero/x.ts", code: `import { format } from "date-fns";`, forbidden: true },
  { name: "aero imports node", filePath: "lib/aero/x.ts", code: `import fs from "node:fs";`, forbidden: true },
  { name: "nested aero escapes", filePath: "lib/aero/deep/x.ts", code: `import { now } from "../../clock";`, forbidden: true },
  { name: "nested aero stays inside", filePath: "lib/aero/deep/x.ts", code: `import { ktToMs } from "../units";`, forbidden: false },
  {
    name: "aero bench drives a browser",
    filePath: "lib/aero/bench/x.ts",
    code: `import { chromium } from "playwright-core";\nimport path from "node:path";\nimport { sampleCurves } from "../index";\nimport { newFrame } from "../../curve-lab/chart-frame";`,
    forbidden: false,
  },
  {
    name: "aero bench imports a component",
    filePath: "lib/aero/bench/x.ts",
    code: `import { CurveChart } from "../../../components/charts/curve-chart";`,
    forbidden: true,
  },
  { name: "aero bench imports lib outside", filePath: "lib/aero/bench/x.ts", code: `import { now } from "../../clock";`, forbidden: true },
  // components/ is UI: only app/, components/ and unit tests import it
  {
    name: "db/access imports a component",
    filePath: "db/access/x/y.ts",
    code: `import type { DemoSpec } from "@/components/charts/demo-spec";`,
    forbidden: true,
  },
  { name: "seed imports a component", filePath: "db/seed/x.ts", code: `import { x } from "../../components/charts/x";`, forbidden: true },
  {
    name: "e2e test imports a component",
    filePath: "tests/e2e/x.test.ts",
    code: `import { x } from "@/components/charts/x";`,
    forbidden: true,
  },
  {
    name: "db/access imports lib",
    filePath: "db/access/x/y.ts",
    code: `import { demoSpecSchema } from "@/lib/curve-lab/schema";`,
    forbidden: false,
  },
  // db/ is loaded by the seed and the CLI outside Next.js
  {
    name: "db/access imports the framework guard",
    filePath: "db/access/x/y.ts",
    code: `import { can } from "@/lib/auth/guard";`,
    forbidden: true,
  },
  { name: "db/access imports can()", filePath: "db/access/x/y.ts", code: `import { can } from "@/lib/auth/can";`, forbidden: false },
  {
    name: "unit test imports a component",
    filePath: "tests/unit/x/y.test.tsx",
    code: `import { Caution } from "@/components/caution";`,
    forbidden: false,
  },
];

function lint(snippets: { filePath: string; code: string }[]): { ruleId: string | null; message: string }[][] {
  const root = path.resolve(__dirname, "../../..");
  const out = execFileSync(process.execPath, [path.join(__dirname, "lint-snippets.mjs")], {
    cwd: root,
    input: JSON.stringify(snippets),
    encoding: "utf8",
    maxBuffer: 16 * 1024 * 1024,
  });
  return JSON.parse(out);
}

describe("ESLint layer boundaries", () => {
  let results: { ruleId: string | null; message: string }[][];
  beforeAll(() => {
    // `export {}` keeps every snippet a module; unused-import warnings are not boundary rules.
    results = lint(cases.map(({ filePath, code }) => ({ filePath, code: `${code}\nexport {};\n` })));
  }, 120_000);

  it.each(cases.map((c, i) => [c.name, c, i] as const))("%s", (_name, c, i) => {
    const messages = results[i]!;
    expect(messages.filter((m) => m.ruleId === null)).toEqual([]); // no parse error
    const boundary = messages.filter((m) => m.ruleId !== null && BOUNDARY_RULES.has(m.ruleId));
    if (c.forbidden) expect(boundary.length).toBeGreaterThan(0);
    else expect(boundary).toEqual([]);
  });
});
