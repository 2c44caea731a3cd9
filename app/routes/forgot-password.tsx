import { data, Form, Link, useActionData, useNavigation } from "react-router";
import type { Route } from "./+types/forgot-password";
import { AuthFrame } from "~/components/auth-frame";
import { Notice, TextField } from "~/components/form-fields";
import { fieldErrors, forgotPasswordForm, type FieldErrors } from "~/lib/forms/account";
import { callAuthEndpoint } from "~/.server/auth";
import { actionRetryAfter, retryAfterHeaders } from "~/.server/auth-response";
import { config } from "~/.server/config";

export const headers = actionRetryAfter;
export const meta: Route.MetaFunction = () => [{ title: "Reset your password · Sinewright" }];

export async function action({ request }: Route.ActionArgs) {
  const form = Object.fromEntries(await request.formData());
  const parsed = forgotPasswordForm.safeParse(form);
  if (!parsed.success) return data({ sent: false, errors: fieldErrors(parsed.error) as FieldErrors }, { status: 400 });
  const response = await callAuthEndpoint(request, "/request-password-reset", {
    email: parsed.data.email,
    redirectTo: new URL("/reset-password", config().APP_URL).toString(),
  });
  if (response.status === 429) {
    return data({ sent: false, errors: { form: "Too many requests. Wait a few minutes, then try again." } as FieldErrors }, { status: 429, headers: retryAfterHeaders(response) });
  }
  // Same answer whether or not the address has an account: nobody learns who is registered.
  return { sent: true, errors: {} as FieldErrors };
}

export default function ForgotPassword() {
  const result = useActionData<typeof action>();
  const busy = useNavigation().state !== "idle";
  return (
    <AuthFrame
      title="Reset your password"
      lead="We will e-mail you a link to choose a new one."
      footer={
        <Link className="underline" to="/sign-in">
          Back to sign-in
        </Link>
      }
    >
      {result?.sent ? (
        <Notice tone="success">If an account uses that address, a reset link is on its way. It works for one hour.</Notice>
      ) : (
        <Form method="post" className="space-y-4" noValidate>
          {result?.errors.form ? <Notice tone="caution">{result.errors.form}</Notice> : null}
          <TextField name="email" type="email" label="E-mail" autoComplete="email" error={result?.errors.email} required />
          <div className="flex justify-end">
            <button type="submit" className="btn btn-primary" disabled={busy}>
              Send the link
            </button>
          </div>
        </Form>
      )}
    </AuthFrame>
  );
}
