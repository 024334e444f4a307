import type { Config } from "jest";
import nextJest from "next/jest.js";

// Three layers, one file: unit (jsdom), integration (node + real PostgreSQL),
// e2e (node driving Debian's Chromium against one production build).
const createJestConfig = nextJest({ dir: "./" });

const shared = {
  moduleNameMapper: { "^server-only$": "<rootDir>/tests/setup/empty.ts", "^@/(.*)$": "<rootDir>/$1" },
  testPathIgnorePatterns: ["/node_modules/", "/.next/"],
};

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
  })();
  return { projects: [unit, integration, e2e] as Config["projects"] };
}
