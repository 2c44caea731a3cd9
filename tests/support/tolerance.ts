import { expect } from "vitest";

/**
 * The one float comparison used by the engine tests: passes when |actual − expected|
 * is within `rel` of |expected| or within `abs`, whichever is larger.
 */
export function expectClose(actual: number, expected: number, opts: { rel?: number; abs?: number } = {}, what = "value"): void {
  const rel = opts.rel ?? 1e-9;
  const abs = opts.abs ?? 0;
  const allowed = Math.max(Math.abs(expected) * rel, abs);
  const diff = Math.abs(actual - expected);
  expect(Number.isFinite(actual), `${what} should be finite, got ${actual}`).toBe(true);
  expect(diff <= allowed, `${what}: expected ${expected} ± ${allowed}, got ${actual} (off by ${diff})`).toBe(true);
}
