import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

// Layer boundaries (DEVELOPERS.md "Boundaries"), checked by `no-restricted-imports` for static
// imports and `no-restricted-syntax` for `import()` / `require()`. Each file gets exactly one
// zone below (a later config object replaces a rule's options, it does not merge them), so the
// zones are listed from general to specific. tests/unit/tooling/boundaries.test.ts shows each
// rule firing on a forbidden import and staying quiet on an allowed one.

/** A forbidden import: `regex` is matched against the import's source string as written. */
const rule = (regex, message) => ({ regex, message });

const DRIVERS = rule(
  "^(sequelize|pg|pg-boss|pg-hstore)(/.*)?$",
  "Only db/** talks to the database driver: call a function from @/db/access/<area>/<use-case> instead.",
);
const DRIVERS_BUT_PG_BOSS = rule(DRIVERS.regex.replace("|pg-boss", ""), DRIVERS.message);
const DB_OUTSIDE_ACCESS = rule(
  "^(@/|(\\.\\./)+)db(/(?!access(/|$)).*)?$",
  "Outside db/ only @/db/access/** may be imported (no models, no sequelize instance, no seed or migrations).",
);
const ANY_DB = rule("^(@/|(\\.\\./)+)db(/.*)?$", "components/ get their data through props from app/ pages; they never import db/.");
const COMPONENTS = rule(
  "^(@/|(\\.\\./)+)components(/.*)?$",
  "Only UI code (app/, components/, tests/unit) imports components/: move shared rules to lib/<area>/.",
);
// The seed and the CLI load db/ outside Next.js, where next/navigation (pulled in by lib/auth/guard) does not load.
const FRAMEWORK_GUARD = rule(
  "^(@/|(\\.\\./)+)lib/auth/guard$",
  "db/ asks can() from @/lib/auth/can: lib/auth/guard pulls in next/navigation, which the seed and the CLI cannot load.",
);
// lib/aero is a self-contained package: relative imports that stay inside lib/aero, and zod.
const AERO_PACKAGES = rule("^(?!zod$|\\.\\.?/)", "lib/aero imports nothing outside lib/aero except zod.");
const aeroEscape = (depth) => rule(`^(\\.\\./){${depth + 1},}`, "lib/aero imports nothing outside lib/aero except zod.");
// Its bench is tooling: it may also drive a browser (node:*, playwright-core) with Curve Lab's pure frame code.
const BENCH_PACKAGES = rule(
  "^(?!zod$|node:|playwright-core$|@/lib/curve-lab/|\\.\\.?/)",
  "lib/aero/bench imports lib/aero, lib/curve-lab, zod, node:* and playwright-core only.",
);
const BENCH_ESCAPE = rule(
  "^(\\.\\./){3,}|^\\.\\./\\.\\./(?!curve-lab/)",
  "lib/aero/bench imports lib/aero, lib/curve-lab, zod, node:* and playwright-core only.",
);

/** One zone: the same list checked on static imports, `import("…")` and `require("…")`. */
function zone(files, rules, ignores = []) {
  // esquery regex literals end at the first "/", so every "/" inside is escaped.
  const selectorRegex = (regex) => regex.replaceAll("/", "\\/");
  return {
    files,
    ignores,
    rules: {
      "no-restricted-imports": ["error", { patterns: rules }],
      "no-restricted-syntax": [
        "error",
        ...rules.flatMap(({ regex, message }) => [
          { selector: `ImportExpression > Literal.source[value=/${selectorRegex(regex)}/]`, message },
          { selector: `CallExpression[callee.name="require"] > Literal[value=/${selectorRegex(regex)}/]`, message },
        ]),
      ],
    },
  };
}

const TS = "{ts,tsx,mts,mjs,js}";
const boundaries = [
  zone([`app/**/*.${TS}`], [DRIVERS, DB_OUTSIDE_ACCESS]),
  zone([`components/**/*.${TS}`], [DRIVERS, ANY_DB]),
  zone([`lib/**/*.${TS}`], [DRIVERS, DB_OUTSIDE_ACCESS, COMPONENTS]),
  // pg-boss plumbing of the mail queue: pg-boss keeps its own connection pool and schema.
  zone(["lib/mail/queue.ts", "lib/mail/worker.ts"], [DRIVERS_BUT_PG_BOSS, DB_OUTSIDE_ACCESS, COMPONENTS]),
  ...[0, 1, 2, 3].map((depth) =>
    zone([`lib/aero/${"*/".repeat(depth)}*.${TS}`], [AERO_PACKAGES, aeroEscape(depth)], [`lib/aero/bench/**`]),
  ),
  zone([`lib/aero/bench/**/*.${TS}`], [BENCH_PACKAGES, BENCH_ESCAPE]),
  zone([`proxy.ts`, `tests/integration/**/*.${TS}`, `tests/e2e/**/*.${TS}`, `tests/helpers/**/*.${TS}`], [COMPONENTS]),
  zone([`db/**/*.${TS}`], [COMPONENTS, FRAMEWORK_GUARD]),
];

const config = [
  ...nextVitals,
  ...nextTs,
  { ignores: [".next/**", ".next-*/**", ".data/**", "node_modules/**", "tests/artifacts/**", "next-env.d.ts"] },
  ...boundaries,
];

export default config;
