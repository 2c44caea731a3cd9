import { z } from "zod";

/** Form schemas shared by the pages and their actions, so the browser and the server agree. */
export const email = z.string().trim().toLowerCase().email("Enter an e-mail address such as name@firm.com.");
const newPassword = z.string().min(10, "Use at least 10 characters for the password.").max(128, "Use at most 128 characters.");

export const signInForm = z.object({
  email,
  password: z.string().min(1, "Enter your password."),
});

export const signUpForm = z.object({
  name: z.string().trim().min(1, "Enter your name as colleagues know it.").max(80, "Use at most 80 characters."),
  email,
  password: newPassword,
});

export const forgotPasswordForm = z.object({ email });

export const resetPasswordForm = z
  .object({ token: z.string().min(1, "The reset link is incomplete: open it again from the e-mail."), password: newPassword, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ." });

export const teamForm = z.object({
  name: z.string().trim().min(2, "Give the team a name of at least 2 characters.").max(80, "Use at most 80 characters."),
});

/** Field errors keyed by input name, the shape every form action returns. */
export type FieldErrors = Partial<Record<string, string>>;

export function fieldErrors(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = String(issue.path[0] ?? "form");
    out[key] ??= issue.message;
  }
  return out;
}

/** Control characters, whitespace and backslashes: browsers drop or reinterpret them, which turns "/\t/evil" into "//evil". */
const UNSAFE_IN_TARGET = /[\u0000-\u0020\u007f-\u009f\u00a0\u1680\u2000-\u200f\u2028\u2029\u202f\u205f\u3000\ufeff\\]/u;

/**
 * The one rule for a redirect target read from a request (`next`): only a path on the
 * app's own origin, written plainly. It is resolved against the app's address and
 * refused — answering `fallback` — when it leaves that origin, starts with `//`, or
 * holds control characters, whitespace or backslashes anywhere (in its path also
 * percent-encoded; an encoded space in a query is fine).
 */
export function safeNext(next: unknown, appUrl: string, fallback = "/sheets"): string {
  if (typeof next !== "string" || !next.startsWith("/") || next.length > 2_000) return fallback;
  let decodedPath: string;
  try {
    decodedPath = decodeURIComponent(next.split(/[?#]/, 1)[0]!);
  } catch {
    return fallback;
  }
  if ([next, decodedPath].some((form) => UNSAFE_IN_TARGET.test(form) || form.startsWith("//"))) return fallback;
  const origin = new URL(appUrl).origin;
  const target = new URL(next, origin);
  if (target.origin !== origin) return fallback;
  return target.pathname + target.search + target.hash;
}
