import { data, Form, Link, redirect, useActionData, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/reset-password";
import { AuthFrame } from "~/components/auth-frame";
import { FormError, TextField } from "~/components/form-fields";
import { fieldErrors, resetPasswordForm, type FieldErrors } from "~/lib/forms/account";
import { callAuthEndpoint } from "~/.server/auth";
import { actionRetryAfter, retryAfterHeaders } from "~/.server/auth-response";

export const headers = actionRetryAfter;
export const meta: Route.MetaFunction = () => [{ title: "Choose a new password · Sinewright" }];

export async function action({ request }: Route.ActionArgs) {
  const form = Object.fromEntries(await request.formData());
  const parsed = resetPasswordForm.safeParse(form);
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error) as FieldErrors }, { status: 400 });
  const response = await callAuthEndpoint(request, "/reset-password", { token: parsed.data.token, newPassword: parsed.data.password });
  if (response.status === 429) {
    return data({ errors: { form: "Too many attempts. Wait a few minutes, then try again." } as FieldErrors }, { status: 429, headers: retryAfterHeaders(response) });
  }
  if (!response.ok) {
    return data({ errors: { form: "This reset link has expired or was already used. Ask for a new one." } as FieldErrors }, { status: 400 });
  }
  throw redirect("/sign-in?reset=done");
}

export default function ResetPassword() {
  const result = useActionData<typeof action>();
  const [params] = useSearchParams();
  const busy = useNavigation().state !== "idle";
  const token = params.get("token") ?? "";
  const linkError = params.get("error");
  return (
    <AuthFrame title="Choose a new password" footer={<Link className="underline" to="/forgot-password">Ask for a new link</Link>}>
      <Form method="post" className="space-y-4" noValidate>
        <FormError message={result?.errors.form ?? result?.errors.token ?? (linkError ? "This reset link is not valid any more. Ask for a new one." : undefined)} />
        <input type="hidden" name="token" value={token} />
        <TextField name="password" type="password" label="New password" autoComplete="new-password" hint="At least 10 characters." error={result?.errors.password} required />
        <TextField name="confirm" type="password" label="Repeat the new password" autoComplete="new-password" error={result?.errors.confirm} required />
        <div className="flex justify-end">
          <button type="submit" className="btn btn-primary" disabled={busy || !token}>
            Save the new password
          </button>
        </div>
      </Form>
    </AuthFrame>
  );
}
