/**
 * What changed between two revisions of a sheet, block by block: added and removed
 * blocks, inputs typed differently, and scalar results whose value moved.
 */
export interface DiffBlock {
  blockId: string;
  calculator: string;
  inputs: Record<string, string>;
  results: Record<string, unknown> | null;
  ok: boolean;
}

export interface BlockChange {
  blockId: string;
  calculator: string;
  kind: "added" | "removed" | "changed" | "unchanged";
  inputs: { key: string; from: string | undefined; to: string | undefined }[];
  results: { key: string; from: string | undefined; to: string | undefined }[];
}

function scalarDisplays(results: Record<string, unknown> | null): Record<string, { value: number; display: string }> {
  const out: Record<string, { value: number; display: string }> = {};
  for (const [key, result] of Object.entries(results ?? {})) {
    if (result && typeof result === "object" && !Array.isArray(result) && "display" in result && "value" in result) {
      out[key] = { value: Number((result as { value: number }).value), display: String((result as { display: string }).display) };
    }
  }
  return out;
}

/** Relative change that counts as a changed result; below it, floating-point noise. */
const RESULT_TOLERANCE = 1e-9;

export function diffRevisions(from: DiffBlock[], to: DiffBlock[]): BlockChange[] {
  const before = new Map(from.map((b) => [b.blockId, b]));
  const after = new Map(to.map((b) => [b.blockId, b]));
  const ids = [...to.map((b) => b.blockId), ...from.map((b) => b.blockId).filter((id) => !after.has(id))];
  return ids.map((blockId) => {
    const a = before.get(blockId);
    const b = after.get(blockId);
    const calculator = (b ?? a)!.calculator;
    const inputKeys = [...new Set([...Object.keys(a?.inputs ?? {}), ...Object.keys(b?.inputs ?? {})])].sort();
    const inputs = inputKeys
      .filter((key) => a?.inputs[key] !== b?.inputs[key])
      .map((key) => ({ key, from: a?.inputs[key], to: b?.inputs[key] }));
    const ra = scalarDisplays(a?.results ?? null);
    const rb = scalarDisplays(b?.results ?? null);
    const resultKeys = [...new Set([...Object.keys(ra), ...Object.keys(rb)])].sort();
    const results = resultKeys
      .filter((key) => {
        const x = ra[key];
        const y = rb[key];
        if (!x || !y) return true;
        return Math.abs(x.value - y.value) > RESULT_TOLERANCE * Math.max(Math.abs(x.value), Math.abs(y.value), 1e-300);
      })
      .map((key) => ({ key, from: ra[key]?.display, to: rb[key]?.display }));
    const kind = !a ? "added" : !b ? "removed" : inputs.length > 0 || results.length > 0 || a.calculator !== b.calculator ? "changed" : "unchanged";
    return { blockId, calculator, kind, inputs, results };
  });
}
