/**
 * How a calculator reports inputs that are each valid alone but not together
 * (e.g. an IGBT chosen but no saturation voltage given): throw a
 * CalculationError from `compute`; the runner turns it into field errors.
 */
import type { FieldError } from "./types";

export class CalculationError extends Error {
  readonly fieldErrors: FieldError[];

  constructor(errors: FieldError | FieldError[]) {
    const list = Array.isArray(errors) ? errors : [errors];
    super(list.map((e) => `${e.field}: ${e.message}`).join("; "));
    this.name = "CalculationError";
    this.fieldErrors = list;
  }
}

/** Shorthand for a single field problem. */
export function fieldError(field: string, message: string): CalculationError {
  return new CalculationError({ field, message });
}
