/**
 * `npm run bench`: speed figures for lib/aero. Each section prints labelled
 * lines and a PASS/FAIL; the process exits non-zero if any section fails.
 * New sections (e.g. a browser figure) go into `sections` below.
 */
import { formatCurvesBench, runCurvesBench } from "./curvesBench";

export interface BenchSection {
  name: string;
  lines: string[];
  pass: boolean;
}

export async function runAeroBench(): Promise<BenchSection[]> {
  const curves = runCurvesBench();
  const sections: BenchSection[] = [{ name: "curves", lines: formatCurvesBench(curves), pass: curves.pass }];
  if (process.env.CHALKWING_BENCH_BROWSER !== "off") sections.push(await (await import("./browser")).runBrowserBench()); // Curve Lab's browser figure
  return sections;
}

export async function main(): Promise<number> {
  console.log(`[aero] node ${process.version}, ${process.platform}/${process.arch}`);
  const sections = await runAeroBench();
  for (const s of sections) for (const line of s.lines) console.log(line);
  const pass = sections.every((s) => s.pass);
  console.log(`[aero] overall: ${pass ? "PASS" : "FAIL"}`);
  return pass ? 0 : 1;
}

if (require.main === module) {
  main().then(
    (code) => {
      process.exitCode = code;
    },
    (error: unknown) => {
      console.error(error);
      process.exitCode = 1;
    },
  );
}
