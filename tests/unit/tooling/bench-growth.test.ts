/** @jest-environment node */
// The scale bench's growth target: an endpoint's p97.5 at the large size over its own at the small
// one; an export of every row (endpoints.ts, `export`) is judged per megabyte exported, since its
// answer grows with the data by design and only the cost of a row must not.
import { growth } from "@/lib/bench/scale-report";
import type { Figure } from "@/lib/bench/figures";

const figure = (path: string, p97_5: number, bytes: number, error: string | null = null): Figure => ({
  name: `chief ${path}`,
  role: "chief",
  path,
  status: 200,
  bytes,
  singleMs: 1,
  error,
  load: { connections: 32, mode: "5 s", requests: 100, rps: 10, p50: p97_5, p97_5, p99: p97_5, non2xx: 0, errors: 0, timeouts: 0 },
});

test("a page: p97.5 large over small, whatever its size", () => {
  expect(growth(figure("/today", 200, 60_000), figure("/today", 300, 66_000))).toBeCloseTo(1.5);
});

test("the register's CSV: per megabyte exported (100 times the rows in 80 times the time is 0.8)", () => {
  expect(growth(figure("/api/register/export", 100, 1e5), figure("/api/register/export", 8_000, 1e7))).toBeCloseTo(0.8);
  // the same export growing faster than its rows fails the target
  expect(growth(figure("/api/register/export", 100, 1e5), figure("/api/register/export", 20_000, 1e7))!).toBeGreaterThan(1.5);
});

test("an error or an empty export at either size gives no figure", () => {
  expect(growth(undefined, figure("/today", 1, 1))).toBeNull();
  expect(growth(figure("/today", 1, 1, "boom"), figure("/today", 1, 1))).toBeNull();
  expect(growth(figure("/api/register/export", 1, 0), figure("/api/register/export", 1, 10))).toBeNull();
});
