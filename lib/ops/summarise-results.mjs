// Reads jest's --json result files and prints the one closing line CI reads.
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";

const [dir, failedPhasesRaw] = process.argv.slice(2);
let passed = 0;
let failed = 0;
for (const f of readdirSync(dir).filter((n) => n.endsWith(".json"))) {
  const r = JSON.parse(readFileSync(path.join(dir, f), "utf8"));
  passed += r.numPassedTests;
  // pending (skipped) and todo tests count as missing, so as failed
  failed += r.numFailedTests + r.numPendingTests + (r.numTodoTests ?? 0);
  // a test file that failed to run at all (syntax error, setup failure) has no test results
  failed += r.testResults.filter((t) => t.status === "failed" && t.assertionResults.length === 0).length;
}
// a phase that failed without a jest result (install, build, server start) counts once
const phaseFailures = Number(failedPhasesRaw || 0);
// (jest phases that failed already counted their failed tests; others count once each)
failed += Number(process.env.CHALKWING_NON_JEST_FAILURES || 0);
console.log(`tests: ${passed} passed, ${failed} failed`);
process.exit(failed > 0 || phaseFailures > 0 ? 1 : 0);
