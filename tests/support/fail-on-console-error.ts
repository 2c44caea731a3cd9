import { afterEach } from "vitest";

// An unexpected console.error is a bug the user would see in logs: fail the test.
let errors: unknown[][] = [];
const original = console.error;
console.error = (...args: unknown[]) => {
  errors.push(args);
  original(...args);
};
afterEach(() => {
  const seen = errors;
  errors = [];
  if (seen.length > 0) {
    throw new Error(`console.error was called ${seen.length} time(s): ${String(seen[0]?.[0])}`);
  }
});
