// Types for the parts of local.mjs that tests use.
export const root: string;
export function freePort(): Promise<number>;
export function waitFor(check: () => Promise<boolean>, what: string, timeoutMs?: number): Promise<void>;
export function runNode(args: string[], env: Record<string, string>, label: string): Promise<void>;
