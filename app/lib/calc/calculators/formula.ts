/**
 * A free formula over other blocks' results, with units: `qs1.v1Rms * 2`,
 * `dc1.c to uF`, `sqrt(hb1.vrms^2 - hb1.v1Rms^2)`.
 *
 * Runs in the restricted expression evaluator (safe-expression.ts): arithmetic,
 * units and a short list of functions; no assignment, no definitions, no other
 * property access. The result keeps its unit; a result in one of the engine's
 * dimensions is reported in that dimension's SI unit, and `to <unit>` sets the
 * unit shown. A bare reference keeps the referenced result as it is (a % stays %).
 *
 * Source: none needed — arithmetic on other results; unit handling by mathjs.
 */
import { fieldError } from "../errors";
import { formatQuantity, scalar } from "../format";
import { evaluateExpression } from "../safe-expression";
import { SI_UNIT } from "../format";
import { dimensionOf } from "../units";
import type { Calculator, ExpressionInputSpec, ScalarResult } from "../types";

const exprInput: ExpressionInputSpec = {
  key: "expr",
  label: "Expression",
  description: "Arithmetic with units over other blocks' outputs, e.g. qs1.v1Rms * 1.1 or dc1.c to uF.",
  kind: "expression",
};

function isScalar(value: unknown): value is ScalarResult {
  return typeof value === "object" && value !== null && !Array.isArray(value) && typeof (value as ScalarResult).value === "number" && typeof (value as ScalarResult).unit === "string";
}

export const calculator: Calculator = {
  id: "formula",
  title: "Formula",
  summary: "Arithmetic with units over other blocks' results.",
  description:
    "Combines results of other blocks on the sheet with numbers, units and common functions (sqrt, abs, trigonometry, exp, " +
    "log, min, max, rounding). Refer to a result as blockId.output; convert with `to`, e.g. dc1.c to uF.",
  inputs: [exprInput],
  outputs: [{ key: "value", label: "Value", kind: "scalar" }],
  formulas: [],
  conventions: [
    "Refer to another block's output as blockId.output, e.g. qs1.v1Rms.",
    "Percent results become fractions in arithmetic (48.3 % → 0.483) but a percentage scaled by pure numbers stays a percentage (qs1.thd * 1.1 → 53.1 %); decibel results are used as their dB number.",
    "The difference of two temperatures is a temperature difference, shown in K.",
    "Adding or subtracting quantities of different kinds (48 V + 2 A) is refused with the two quantities named.",
    "Angles in trigonometric functions need a unit (sin(30 deg)); a bare number is taken as radians.",
    "Allowed functions: sqrt, abs, sin, cos, tan, asin, acos, atan, exp, log, log10, min, max, round, floor, ceil, pow.",
  ],
  sources: ["Unit arithmetic and conversion by mathjs (general-purpose library)."],
  cautions: ["A formula is only as sound as the results it combines: check the units and assumptions of every block it refers to."],
  compute(inputs, context) {
    const expr = inputs.expr;
    if (typeof expr !== "string") throw fieldError("expr", "expr must be an expression, e.g. qs1.v1Rms * 2");
    const outcome = evaluateExpression(expr, context?.blockResults ?? {});
    if (!outcome.ok) throw fieldError("expr", outcome.message);
    if (outcome.kind === "result") {
      throw fieldError("expr", `${outcome.reference.block}.${outcome.reference.output} is not a single quantity; a formula needs a number with a unit`);
    }
    if (outcome.single && isScalar(outcome.single.value)) {
      return { results: { value: outcome.single.value }, warnings: [] };
    }

    const quantity = outcome.quantity;
    const pure = typeof quantity === "number" ? quantity : quantity.units.length === 0 ? quantity.toNumber() : undefined;
    // A percentage scaled by pure numbers stays a percentage (qs1.thd * 1.1 → 31.9 %, not 0.319).
    if (pure !== undefined) return { results: { value: outcome.percent ? scalar(pure * 100, "%") : scalar(pure, "") }, warnings: [] };
    if (typeof quantity === "number") return { results: { value: scalar(quantity, "") }, warnings: [] };

    const dimension = dimensionOf(quantity);
    // A difference of temperatures comes back in kelvin: keep it a temperature difference, not a reading in °C.
    if (dimension === "temperature" && !outcome.targetUnit && quantity.units[0]?.unit.name === "K") {
      return { results: { value: scalar(quantity.toNumber("K"), "K") }, warnings: [] };
    }
    if (outcome.targetUnit) {
      const shown = quantity.toNumber(outcome.targetUnit);
      const siUnit = dimension ? SI_UNIT[dimension] : quantity.formatUnits();
      const siValue = dimension ? quantity.toNumber(siUnit) : shown;
      const display = formatQuantity(shown, outcome.targetUnit.replace(/^u/, "µ"));
      return { results: { value: { value: siValue === 0 ? 0 : siValue, unit: siUnit, display } }, warnings: [] };
    }
    if (dimension) {
      const unit = SI_UNIT[dimension];
      return { results: { value: scalar(unit === "" ? quantity.toNumber() : quantity.toNumber(unit), unit) }, warnings: [] };
    }
    // A unit outside the engine's dimensions (V/s, A²…): keep it as mathjs simplifies it.
    const units = quantity.formatUnits();
    return {
      results: { value: scalar(quantity.toNumber(units), units) },
      warnings: [`The result's unit (${units}) is not one of the engine's quantities; other blocks can use it only in formulas.`],
    };
  },
};
