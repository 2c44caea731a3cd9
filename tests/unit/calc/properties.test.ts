/**
 * Property tests over the whole registry: junk never throws, valid inputs never
 * give NaN or ±Infinity, and the way a quantity is spelled never changes a result.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { evaluateCalculator, evaluateSheet } from "~/lib/calc/evaluate-sheet";
import { parseInputs } from "~/lib/calc/inputs";
import { calculators } from "~/lib/calc/registry";
import type { InputSpec } from "~/lib/calc/types";
import { SI_UNIT } from "~/lib/calc/format";

/** Every number anywhere in a value, to check they are all finite. */
function numbersIn(value: unknown, found: number[] = []): number[] {
  if (typeof value === "number") found.push(value);
  else if (Array.isArray(value)) value.forEach((item) => numbersIn(item, found));
  else if (typeof value === "object" && value !== null) Object.values(value).forEach((item) => numbersIn(item, found));
  return found;
}

function expectWellFormedErrors(errors: unknown) {
  expect(Array.isArray(errors)).toBe(true);
  expect((errors as unknown[]).length).toBeGreaterThan(0);
  for (const error of errors as { field: unknown; message: unknown }[]) {
    expect(typeof error.field).toBe("string");
    expect(typeof error.message).toBe("string");
  }
}

/** A raw value an engineer (or the API) could plausibly send for this input, in range. */
function plausible(spec: InputSpec): fc.Arbitrary<unknown> {
  switch (spec.kind) {
    case "quantity": {
      const unit = SI_UNIT[spec.dimension];
      const number = spec.integer
        ? fc.integer({ min: Math.ceil(spec.min ?? 0), max: Math.min(Math.floor(spec.max ?? 1e4), 200) })
        : fc.double({ min: spec.min ?? -1e6, max: spec.max ?? 1e6, minExcluded: !!spec.minExclusive, maxExcluded: !!spec.maxExclusive, noNaN: true });
      return number.map((v) => (unit === "" ? v : `${v} ${unit}`));
    }
    case "choice":
      return fc.constantFrom(...spec.options.map((o) => o.value));
    case "quantityList":
      return fc
        .array(fc.double({ min: spec.min ?? 0, max: spec.max ?? 1e3, noNaN: true, maxExcluded: true }), { minLength: spec.minItems ?? 1, maxLength: Math.min(spec.maxItems ?? 5, 5) })
        .map((list) => [...list].sort((a, b) => a - b).map((v) => `${v} ${SI_UNIT[spec.dimension]}`));
    case "spectrum":
      return fc.uniqueArray(fc.record({ n: fc.integer({ min: 1, max: 60 }), value: fc.double({ min: 0, max: 100, noNaN: true }) }), { minLength: 1, maxLength: 20, selector: (line) => line.n });
    case "expression":
      return fc.constantFrom("2 V * 3", "sqrt(2) * 1 A", "10 uF to nF");
  }
}

/**
 * Inputs whose valid values are narrower than their range says: harmonic orders to remove
 * are distinct odd, non-triplen whole numbers, and a solution number is rarely above the few
 * solutions found. Drawn from the range alone, almost every run would be refused.
 */
const NARROWER: Record<string, Record<string, fc.Arbitrary<unknown>>> = {
  "harmonic-elimination": {
    eliminate: fc.uniqueArray(fc.constantFrom(5, 7, 11, 13, 17, 19), { minLength: 1, maxLength: 4 }).map((orders) => [...orders].sort((a, b) => a - b).join(", ")),
    pick: fc.constantFrom("1", "2"),
  },
};

function plausibleInputs(specs: InputSpec[], narrower: Record<string, fc.Arbitrary<unknown>> = {}): fc.Arbitrary<Record<string, unknown>> {
  const shape: Record<string, fc.Arbitrary<unknown>> = {};
  for (const spec of specs) {
    const value = narrower[spec.key] ?? plausible(spec);
    shape[spec.key] = spec.optional || spec.default !== undefined ? fc.option(value, { nil: undefined }) : value;
  }
  return fc.record(shape);
}

describe.each(calculators.map((c) => [c.id, c] as const))("%s", (id, calculator) => {
  it("never throws on junk, and answers with field errors", () => {
    const keys = calculator.inputs.map((s) => s.key);
    const junkRecord = fc.dictionary(fc.oneof(fc.constantFrom(...keys), fc.string()), fc.oneof(fc.anything(), fc.string(), fc.double()));
    fc.assert(
      fc.property(fc.oneof(fc.anything(), junkRecord), (raw) => {
        const outcome = evaluateCalculator(id, raw);
        if (!outcome.ok) expectWellFormedErrors(outcome.errors);
        else for (const n of numbersIn(outcome.results)) expect(Number.isFinite(n)).toBe(true);
      }),
      { numRuns: 150 },
    );
  });

  it("never returns NaN or ±Infinity for inputs in range", () => {
    let computed = 0;
    fc.assert(
      fc.property(plausibleInputs(calculator.inputs, NARROWER[id]), (raw) => {
        const outcome = evaluateCalculator(id, raw);
        if (!outcome.ok) {
          expectWellFormedErrors(outcome.errors);
          return;
        }
        computed++;
        for (const n of numbersIn(outcome.results)) expect(Number.isFinite(n), `${id}: ${JSON.stringify(raw)}`).toBe(true);
        for (const n of numbersIn(outcome.inputs)) expect(Number.isFinite(n)).toBe(true);
      }),
      { numRuns: 60 },
    );
    // Some in-range combinations are refused (e.g. a MOSFET without R_DS(on)); most must compute.
    expect(computed, "runs that computed").toBeGreaterThan(5);
  });
});

describe("spelling never changes a result", () => {
  // Decimal mantissa and exponent, so every spelling is an exact decimal string.
  const decimal = (minExp: number, maxExp: number) => fc.record({ m: fc.integer({ min: 1, max: 9999 }), e: fc.integer({ min: minExp, max: maxExp }) });
  const spell = ({ m, e }: { m: number; e: number }, shift: number) => `${m}e${e + shift}`;

  it("lc-filter: H/mH/µH/μH, F/uF/nF, Hz/kHz, ohm/Ω/kΩ give identical outputs", () => {
    fc.assert(
      fc.property(decimal(-10, -5), decimal(-12, -7), decimal(-1, 3), decimal(3, 5), (l, c, r, fsw) => {
        const spellings = [
          { l: `${spell(l, 0)} H`, c: `${spell(c, 0)} F`, rLoad: `${spell(r, 0)} ohm`, fsw: `${spell(fsw, 0)} Hz` },
          { l: `${spell(l, 3)} mH`, c: `${spell(c, 6)} uF`, rLoad: `${spell(r, 0)} Ω`, fsw: `${spell(fsw, -3)} kHz` },
          { l: `${spell(l, 6)}µH`, c: `${spell(c, 9)} nF`, rLoad: `${spell(r, -3)} kΩ`, fsw: `${spell(fsw, -3)}kHz` },
          // Case variants with one reading for the dimension are read as that unit (issue #16 item 8).
          { l: `${spell(l, 6)} uh`, c: `${spell(c, 6)} uf`, rLoad: `${spell(r, 0)} Ohm`, fsw: `${spell(fsw, -3)} KHz` },
        ];
        const outcomes = spellings.map((inputs) => evaluateCalculator("lc-filter", inputs));
        const first = outcomes[0]!;
        for (const outcome of outcomes) {
          expect(outcome.ok).toBe(first.ok);
          if (outcome.ok && first.ok) {
            expect(outcome.inputs).toEqual(first.inputs);
            expect(outcome.results).toEqual(first.results);
          }
        }
      }),
      { numRuns: 100 },
    );
  });

  it("angles: deg, °, and rad give the same parsed angle", () => {
    const stepped = calculators.find((c) => c.id === "stepped-wave")!;
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 8999 }), (centi) => {
        const degrees = centi / 100;
        const parsed = [`${degrees} deg`, `${degrees}°`, `${(degrees * Math.PI) / 180} rad`].map((text) => parseInputs(stepped, { vdc: "48 V", angles: [text] }));
        const values = parsed.map((p) => (p.ok ? (p.values.angles as number[])[0]! : Number.NaN));
        for (const v of values) expect(Math.abs(v - degrees)).toBeLessThanOrEqual(1e-9 * Math.max(1, degrees));
      }),
      { numRuns: 100 },
    );
  });
});

describe("evaluateSheet never throws", () => {
  it("on random sheets", () => {
    const ids = fc.constantFrom("a", "b", "c", "qs1", "__proto__", "");
    const block = fc.record({
      id: fc.oneof(ids, fc.anything()),
      calculator: fc.oneof(fc.constantFrom(...calculators.map((c) => c.id)), fc.string()),
      inputs: fc.oneof(fc.anything(), fc.dictionary(fc.string(), fc.oneof(fc.constantFrom("=a.value", "=b.vrms * 2", "=c.harmonics", "=qs1.v1Rms"), fc.string()))),
    });
    fc.assert(
      fc.property(fc.oneof(fc.anything(), fc.array(block, { maxLength: 8 })), (sheet) => {
        const evaluation = evaluateSheet(sheet);
        expect(evaluation.engineVersion).toBeTypeOf("string");
        for (const n of numbersIn(Object.values(evaluation.blocks).map((b) => (b.ok ? b.results : null)))) expect(Number.isFinite(n)).toBe(true);
        expect(() => JSON.stringify(evaluation)).not.toThrow();
      }),
      { numRuns: 200 },
    );
  });
});
