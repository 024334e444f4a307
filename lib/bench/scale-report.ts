/**
 * Prints the scale part of `npm run bench` from the JSON files lib/bench/scale-run.ts wrote (one
 * per size, smallest first): a table per size with each figure beside its ratio to `/api/health`
 * measured on the same server in the same run, then the issue's targets (reported, never asserted):
 * every endpoint's p97.5 at the largest size within 1.5x its own at the smallest, and every
 * endpoint's p97.5 within 3x `/api/health`'s at 32 connections. An export of every row (`export` in
 * endpoints.ts) grows with the data by design, so its growth is judged per megabyte exported.
 *
 * Usage: tsx lib/bench/scale-report.ts small.json [large.json …]
 */
import { readFileSync } from "node:fs";
import type { Figure, SizeRun } from "./figures";
import { ENDPOINTS } from "./endpoints";

const GROWTH_TARGET = 1.5;
const HEALTH_TARGET = 3;

const fmt = (n: number, digits = 1): string => (Number.isFinite(n) ? n.toFixed(digits) : "–");
/** Latency ratios: autocannon reports whole milliseconds, so a 0 ms floor counts as 1 ms. */
const ratio = (a: number, b: number) => a / Math.max(b, 1);

function table(run: SizeRun): string[] {
  const h = run.health.load;
  const lines = [
    `### ${run.students.toLocaleString("en-GB")} generated students (${run.measuredAt.slice(0, 10)}, ${run.connections} connections, ${run.seconds} s each unless said; load average ${fmt(run.loadAverage[0], 2)} → ${fmt(run.loadAverage[1], 2)})`,
    "",
    ...run.healthRuns.map((x, i) =>
      x.load && !x.error
        ? `/api/health ${i === 0 ? "before" : "after"}: p50 ${x.load.p50} ms, p97.5 ${x.load.p97_5} ms, p99 ${x.load.p99} ms, ${fmt(x.load.rps)} req/s`
        : `/api/health ${i === 0 ? "before" : "after"}: ERROR ${x.error}`,
    ),
    "(ratios are to the mean of the two)",
    ...(run.floor
      ? [
          run.floor.load && !run.floor.error && h
            ? `the smallest page (/sign-in signed out: no session, no database read, ${fmt(run.floor.bytes / 1e3, 0)} kB): p50 ${run.floor.load.p50} ms, p97.5 ${run.floor.load.p97_5} ms (${fmt(ratio(run.floor.load.p97_5, h.p97_5))}x health), ${fmt(run.floor.load.rps)} req/s`
            : `the smallest page (/sign-in signed out): ERROR ${run.floor.error ?? "no health figure"}`,
        ]
      : []),
    ...run.signInErrors.map((e) => `sign-in error: ${e}`),
    "",
    "| endpoint | path | one request | size | p50 ms (×health) | p97.5 ms (×health) | p99 ms (×health) | req/s (×health) |",
    "|---|---|---|---|---|---|---|---|",
  ];
  for (const f of run.figures) {
    const l = f.load;
    const size = f.bytes >= 1e6 ? `${fmt(f.bytes / 1e6)} MB` : `${fmt(f.bytes / 1e3, 0)} kB`;
    const single = `${fmt(f.singleMs, 0)} ms`;
    if (f.error || !l || !h) {
      lines.push(`| ${f.name} | \`${f.path}\` | ${single} | ${size} | ERROR: ${f.error ?? "no health figure"} | | | |`);
      continue;
    }
    lines.push(
      `| ${f.name}${l.mode.includes("requests") ? ` (${l.mode})` : ""} | \`${f.path}\` | ${single} | ${size} | ${l.p50} (${fmt(ratio(l.p50, h.p50))}) | ${l.p97_5} (${fmt(ratio(l.p97_5, h.p97_5))}) | ${l.p99} (${fmt(ratio(l.p99, h.p99))}) | ${fmt(l.rps)} (${fmt(l.rps / h.rps, 3)}) |`,
    );
  }
  return lines;
}

function healthTarget(run: SizeRun): string[] {
  const h = run.health.load;
  if (!h) return [`- ${run.students} students: no /api/health figure, target not judged`];
  const miss = run.figures.filter((f) => !f.load || f.error || ratio(f.load.p97_5, h.p97_5) > HEALTH_TARGET);
  const at32 = run.connections === 32 ? "" : ` (measured at ${run.connections} connections, the target names 32)`;
  const floor = run.floor?.load && !run.floor.error ? ratio(run.floor.load.p97_5, h.p97_5) : null;
  return [
    ...(floor !== null
      ? [
          `- the floor at ${run.students} students: the smallest page the framework renders (/sign-in, signed out, no database read) is ${fmt(floor)}x /api/health`,
        ]
      : []),
    `- p97.5 within ${HEALTH_TARGET}x /api/health at ${run.students} students${at32}: ${miss.length === 0 ? "MET" : `NOT MET for ${miss.length} of ${run.figures.length}`}` +
      (miss.length
        ? `: ${miss.map((f) => `${f.name} ${f.load && !f.error ? `${fmt(ratio(f.load.p97_5, h.p97_5))}x` : "error"}`).join(", ")}`
        : ""),
  ];
}

const isExport = (f: Figure) => ENDPOINTS.some((e) => e.export && e.path === f.path && e.role === f.role);

/** p97.5 large ÷ small; for an export, per megabyte exported (null: an error or an empty answer at either size). */
export function growth(s: Figure | undefined, f: Figure): number | null {
  if (!s?.load || !f.load || s.error || f.error) return null;
  if (!isExport(f)) return ratio(f.load.p97_5, s.load.p97_5);
  if (s.bytes <= 0 || f.bytes <= 0) return null;
  return f.load.p97_5 / f.bytes / (Math.max(s.load.p97_5, 1) / s.bytes);
}

function growthTarget(small: SizeRun, large: SizeRun): string[] {
  const bySmall = new Map(small.figures.map((f) => [f.name, f]));
  const rows: { f: Figure; r: number | null }[] = large.figures.map((f) => ({ f, r: growth(bySmall.get(f.name), f) }));
  const miss = rows.filter((x) => x.r === null || x.r > GROWTH_TARGET);
  const name = (f: Figure) => (isExport(f) ? `${f.name} (per MB exported)` : f.name);
  const exports = rows.filter((x) => isExport(x.f));
  return [
    `- p97.5 at ${large.students} students within ${GROWTH_TARGET}x its own at ${small.students}: ${miss.length === 0 ? "MET" : `NOT MET for ${miss.length} of ${rows.length}`}` +
      (miss.length ? `: ${miss.map((x) => `${name(x.f)} ${x.r === null ? "error" : `${fmt(x.r)}x`}`).join(", ")}` : ""),
    `  (each endpoint, p97.5 large ÷ small: ${rows.map((x) => `${name(x.f)} ${x.r === null ? "error" : fmt(x.r)}`).join("; ")})`,
    ...exports.map(({ f }) => {
      const s = bySmall.get(f.name);
      const perMb = (x: Figure | undefined) => (x?.load && x.bytes > 0 ? `${fmt(x.load.p97_5 / (x.bytes / 1e6), 0)} ms/MB` : "–");
      return `  (${f.name}: an export of every row, judged per MB exported: ${perMb(s)} at ${small.students}, ${perMb(f)} at ${large.students})`;
    }),
  ];
}

function main() {
  const files = process.argv.slice(2);
  if (files.length === 0) throw new Error("usage: tsx lib/bench/scale-report.ts size.json [size.json …]");
  const runs = files.map((f) => JSON.parse(readFileSync(f, "utf8")) as SizeRun).sort((a, b) => a.students - b.students);
  for (const run of runs) for (const line of table(run)) console.log(line);
  console.log("");
  console.log("Targets (issue 16; reported, not asserted):");
  for (const run of runs) for (const line of healthTarget(run)) console.log(line);
  const [small, large] = [runs[0]!, runs[runs.length - 1]!];
  if (runs.length > 1) for (const line of growthTarget(small, large)) console.log(line);
  else console.log(`- growth within ${GROWTH_TARGET}x: one size measured only, not judged`);
  const errors = runs.flatMap((r) => [r.health, ...r.figures].filter((f) => f.error).map((f) => `${r.students}: ${f.name}`));
  console.log(errors.length ? `Errors: ${errors.join(", ")}` : "Errors: none");
}

if (process.argv[1]?.endsWith("scale-report.ts")) main();
