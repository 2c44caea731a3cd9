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

/** Only same-site paths are followed after sign-in; anything else goes home. */
export function safeNext(next: unknown, fallback = "/sheets"): string {
  return typeof next === "string" && next.startsWith("/") && !next.startsWith("//") && !next.startsWith("/\\") ? next : fallback;
}
