import { AeroInputError } from "@/lib/aero";

/** |actual - expected| <= tolerance, with a readable failure message. */
export function expectWithin(actual: number, expected: number, tolerance: number): void {
  const diff = Math.abs(actual - expected);
  if (!(diff <= tolerance)) {
    throw new Error(`expected ${actual} to be within ${tolerance} of ${expected} (off by ${diff})`);
  }
}

/** |actual / expected - 1| <= relativeTolerance. */
export function expectRelative(actual: number, expected: number, relativeTolerance: number): void {
  const rel = Math.abs(actual / expected - 1);
  if (!(rel <= relativeTolerance)) {
    throw new Error(`expected ${actual} to be within ${relativeTolerance} (relative) of ${expected} (off by ${rel})`);
  }
}

/** Runs `fn`, asserts it throws AeroInputError naming `field`, and returns the error. */
export function expectInputError(fn: () => unknown, field: string): AeroInputError {
  let caught: unknown;
  try {
    fn();
  } catch (error) {
    caught = error;
  }
  expect(caught).toBeInstanceOf(AeroInputError);
  const error = caught as AeroInputError;
  expect(error.field).toBe(field);
  expect(error.message.startsWith(field) || error.message.includes(field)).toBe(true);
  return error;
}

/** Every number reachable in a (nested) result object or typed array is finite. */
export function expectAllFinite(value: unknown, where = "result"): void {
  if (typeof value === "number") {
    if (!Number.isFinite(value)) throw new Error(`${where} is ${value}`);
    return;
  }
  if (ArrayBuffer.isView(value)) {
    const arr = value as unknown as ArrayLike<number>;
    for (let i = 0; i < arr.length; i++) expectAllFinite(arr[i], `${where}[${i}]`);
    return;
  }
  if (Array.isArray(value)) {
    value.forEach((v, i) => expectAllFinite(v, `${where}[${i}]`));
    return;
  }
  if (typeof value === "object" && value !== null) {
    for (const [k, v] of Object.entries(value)) expectAllFinite(v, `${where}.${k}`);
  }
}
