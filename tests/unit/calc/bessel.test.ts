import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { besselj } from "bessel";
import { besselJ, besselJOrders } from "~/lib/calc/bessel";
import { expectClose } from "../../support/tolerance";

/**
 * Bessel's integral, J_n(x) = (1/2π)∫₀^{2π} cos(nτ − x·sin τ) dτ
 * (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, eq. 9.1.21 — number from memory),
 * by the trapezoid rule over a full period. For a periodic integrand with M points the only
 * error is aliasing from J_{n±M}(x), negligible once M exceeds n + x by a wide margin —
 * an independent check good to ~1e-15.
 */
function besselIntegral(n: number, x: number, points = 1024): number {
  let sum = 0;
  for (let j = 0; j < points; j++) {
    const tau = (2 * Math.PI * j) / points;
    sum += Math.cos(n * tau - x * Math.sin(tau));
  }
  return sum / points;
}

describe("besselJ against published tables", () => {
  // Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, Table 9.1 (10 decimals).
  // Values from memory, unverified; the tolerance is the table's rounding. (The tight checks below need no table.)
  const table: [n: number, x: number, value: number][] = [
    [0, 1, 0.7651976866],
    [1, 1, 0.4400505857],
    [2, 1, 0.1149034849],
    [0, 2, 0.2238907791],
    [1, 2, 0.5767248078],
    [0, 5, -0.1775967713],
    [1, 5, -0.3275791376],
    [0, 10, -0.2459357645],
    [1, 10, 0.0434727462],
  ];
  it.each(table)("J_%i(%d) matches A&S Table 9.1", (n, x, value) => {
    expectClose(besselJ(n, x), value, { abs: 6e-11 }, `J_${n}(${x})`);
  });

  // A&S Table 9.5, first zeros of J0 and J1 and the second zero of J0 (10 decimals; from memory).
  it.each([
    [0, 2.4048255577],
    [1, 3.8317059702],
    [0, 5.5200781103],
  ])("J_%i vanishes at its tabulated zero %d (A&S Table 9.5)", (n, zero) => {
    // A 5e-11 error in the zero moves J by at most |J'| · 5e-11 < 3e-11.
    expectClose(besselJ(n, zero), 0, { abs: 3e-11 }, `J_${n} at ${zero}`);
  });

  it("puts J0's first zero at 2.404825557695773 to double precision (A&S Table 9.5, from memory)", () => {
    expectClose(besselJ(0, 2.404825557695773), 0, { abs: 1e-15 });
  });
});

describe("besselJ against independent computation", () => {
  it("agrees with the `bessel` npm package (SheetJS) for x ≤ 50, n ≤ 60", () => {
    // The package builds J0/J1 from rational approximations good to about 1e-8 and
    // recurs from them, so it is compared at 2e-7; Bessel's integral below is the tight check.
    for (let x = 0.05; x <= 50; x += 0.61) {
      for (let n = 0; n <= 60; n++) {
        expectClose(besselJ(n, x), besselj(x, n), { abs: 2e-7 }, `J_${n}(${x.toFixed(2)})`);
      }
    }
  });

  it("agrees with Bessel's integral to 1e-14 for x ≤ 100, n ≤ 200", () => {
    for (const x of [0.3, 0.5, 0.51, 1, 2.5, 7.3, 12.56, 31.4, 49.9, 75, 100]) {
      const orders = besselJOrders(x, 200);
      for (let n = 0; n <= 200; n += 1) {
        expectClose(orders[n]!, besselIntegral(n, x, 1024), { abs: 1e-14 }, `J_${n}(${x})`);
      }
    }
  });

  it("agrees with Bessel's integral for random orders and arguments (property)", () => {
    fc.assert(
      fc.property(fc.integer({ min: -80, max: 80 }), fc.double({ min: -60, max: 60, noNaN: true }), (n, x) => {
        expectClose(besselJ(n, x), besselIntegral(n, x, 512), { abs: 1e-13 }, `J_${n}(${x})`);
      }),
      { numRuns: 300 },
    );
  });

  it("satisfies J0² + 2·ΣJ_n² = 1 (A&S eq. 9.1.76, number from memory)", () => {
    for (const x of [0.7, 3, 20, 50]) {
      const orders = besselJOrders(x, 120);
      let sum = orders[0]! ** 2;
      for (let n = 1; n <= 120; n++) sum += 2 * orders[n]! ** 2;
      expectClose(sum, 1, { abs: 1e-13 }, `x = ${x}`);
    }
  });

  it("satisfies the three-term recurrence J_{n−1} + J_{n+1} = (2n/x)·J_n (A&S eq. 9.1.27, number from memory)", () => {
    const x = 17.3;
    const orders = besselJOrders(x, 60);
    for (let n = 1; n < 60; n++) {
      expectClose(orders[n - 1]! + orders[n + 1]!, ((2 * n) / x) * orders[n]!, { abs: 1e-14 }, `n = ${n}`);
    }
  });
});

describe("besselJ conventions and edges", () => {
  it("follows J_{−n} = (−1)^n J_n and J_n(−x) = (−1)^n J_n(x)", () => {
    expectClose(besselJ(-3, 2), -besselJ(3, 2), { abs: 0 });
    expectClose(besselJ(-4, 2), besselJ(4, 2), { abs: 0 });
    expectClose(besselJ(3, -2), -besselJ(3, 2), { abs: 0 });
    expectClose(besselJ(-3, -2), besselJ(3, 2), { abs: 0 });
  });

  it("gives J0(0) = 1 and J_n(0) = 0 for n ≥ 1", () => {
    expect(Array.from(besselJOrders(0, 3))).toEqual([1, 0, 0, 0]);
  });

  it("stays finite for tiny arguments and very high orders (values underflow to 0, never NaN)", () => {
    const tiny = besselJOrders(1e-200, 300);
    expect(tiny.every(Number.isFinite)).toBe(true);
    expectClose(tiny[0]!, 1, { abs: 1e-15 });
    expectClose(tiny[1]!, 5e-201, { rel: 1e-12 });
    const high = besselJOrders(3, 1000);
    expect(high.every(Number.isFinite)).toBe(true);
    expect(high[1000]).toBe(0);
  });

  it("refuses a non-integer order, a non-finite argument and a negative nMax", () => {
    expect(() => besselJ(1.5, 2)).toThrow(RangeError);
    expect(() => besselJ(1, Number.NaN)).toThrow(RangeError);
    expect(() => besselJOrders(2, -1)).toThrow(RangeError);
    expect(() => besselJOrders(-2, 3)).toThrow(RangeError);
  });
});
