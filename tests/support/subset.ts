/** True when every key and array item of `expected` appears, with equal value, in `actual` (arrays: same positions). */
export function containsSubset(actual: unknown, expected: unknown, at = "$"): string | null {
  if (expected === null || typeof expected !== "object") {
    return Object.is(actual, expected) ? null : `${at}: expected ${JSON.stringify(expected)}, got ${JSON.stringify(actual)}`;
  }
  if (Array.isArray(expected)) {
    if (!Array.isArray(actual)) return `${at}: expected an array`;
    for (let i = 0; i < expected.length; i++) {
      const problem = containsSubset(actual[i], expected[i], `${at}[${i}]`);
      if (problem) return problem;
    }
    return null;
  }
  if (actual === null || typeof actual !== "object") return `${at}: expected an object`;
  for (const [key, value] of Object.entries(expected)) {
    const problem = containsSubset((actual as Record<string, unknown>)[key], value, `${at}.${key}`);
    if (problem) return problem;
  }
  return null;
}
