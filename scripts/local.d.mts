// Types for the parts of local.mjs that tests use.
export const root: string;
export function runNode(args: string[], env: Record<string, string>, label: string): Promise<void>;
