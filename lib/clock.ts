/**
 * The injectable clock. Everything that decides "what is due now" asks `now()`, so tests
 * move time by setting the clock instead of sleeping.
 * - In-process tests call `setClock(() => new Date(...))` and `resetClock()`.
 * - A test server started with CHALKWING_TEST_CLOCK=on reads an offset from the
 *   `test_clock` setting kept by tests/helpers (never in production).
 */
let source: () => Date = () => new Date();

export function now(): Date {
  return source();
}

export function setClock(fn: () => Date): void {
  source = fn;
}

export function resetClock(): void {
  source = () => new Date();
}

/** A fixed clock that can be moved forward by tests. */
export function fixedClock(start: Date) {
  let t = start.getTime();
  setClock(() => new Date(t));
  return {
    advanceMs(ms: number) {
      t += ms;
    },
    set(d: Date) {
      t = d.getTime();
    },
  };
}
