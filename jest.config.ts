import type { Config } from "jest";
import nextJest from "next/jest.js";

// Three layers, one file: unit (jsdom), integration (node + real PostgreSQL),
// e2e (node driving Debian's Chromium against one production build).
const createJestConfig = nextJest({ dir: "./" });

const shared = {
  moduleNameMapper: { "^server-only$": "<rootDir>/tests/setup/empty.ts", "^@/(.*)$": "<rootDir>/$1" },
  testPathIgnorePatterns: ["/node_modules/", "/.next/"],
};

// The test command runs the e2e layer in two lanes side by side (lib/ops/test.sh), each against its
// own server and database: "harness" takes the files that must see every table unchanged by
// others (the authorisation harness) and the long accessibility crawl; "rest" takes the others.
// Any other value (or none) runs every file.
// Two files that bring their own servers (the second-server topology, the longest-data phone walk)
// ride in the harness lane too, so the two lanes take about the same time.
const HARNESS_LANE_FILES = ["authz/", "a11y\\.test\\.ts$", "security\\.test\\.ts$", "topology\\.test\\.ts$", "phone-longest\\.test\\.ts$"];
function laneIgnores(lane: string | undefined): string[] {
  if (lane === "harness") return [`/tests/e2e/(?!${HARNESS_LANE_FILES.join("|")})`];
  if (lane === "rest") return HARNESS_LANE_FILES.map((f) => `/tests/e2e/${f}`);
  return [];
}

export default async function config(): Promise<Config> {
  const unit = await createJestConfig({
    ...shared,
    displayName: "unit",
    testEnvironment: "jsdom",
    setupFiles: ["jest-canvas-mock"],
    setupFilesAfterEnv: ["<rootDir>/tests/setup/unit.ts"],
    testMatch: ["<rootDir>/tests/unit/**/*.test.ts", "<rootDir>/tests/unit/**/*.test.tsx"],
  } as Config)();
  const integration = await createJestConfig({
    ...shared,
    displayName: "integration",
    testEnvironment: "node",
    setupFilesAfterEnv: ["<rootDir>/tests/setup/integration.ts"],
    testMatch: ["<rootDir>/tests/integration/**/*.test.ts"],
  })();
  const e2e = await createJestConfig({
    ...shared,
    displayName: "e2e",
    testEnvironment: "node",
    setupFilesAfterEnv: ["<rootDir>/tests/setup/e2e.ts"],
    testMatch: ["<rootDir>/tests/e2e/**/*.test.ts"],
    testPathIgnorePatterns: [...shared.testPathIgnorePatterns, ...laneIgnores(process.env.CHALKWING_E2E_LANE)],
  })();
  return { projects: [unit, integration, e2e] as Config["projects"] };
}
