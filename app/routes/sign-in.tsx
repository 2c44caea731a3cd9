import { data, Form, Link, redirect, useActionData, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/sign-in";
import { AuthFrame } from "~/components/auth-frame";
import { FormError, Notice, TextField } from "~/components/form-fields";
import { fieldErrors, safeNext, signInForm, type FieldErrors } from "~/lib/forms/account";
import { identityOf } from "~/.server/access";
import { callAuthEndpoint } from "~/.server/auth";
import { config } from "~/.server/config";
import { actionRetryAfter, authErrorMessage, cookiesFrom, retryAfterHeaders } from "~/.server/auth-response";

export const headers = actionRetryAfter;
export const meta: Route.MetaFunction = () => [{ title: "Sign in · Sinewright" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const signedIn = await identityOf(context);
  if (signedIn) throw redirect(safeNext(new URL(request.url).searchParams.get("next"), config().APP_URL));
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  const form = Object.fromEntries(await request.formData());
  const parsed = signInForm.safeParse(form);
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error) as FieldErrors, email: String(form.email ?? "") }, { status: 400 });
  const response = await callAuthEndpoint(request, "/sign-in/email", parsed.data);
  if (!response.ok) {
    const message =
      response.status === 401 || response.status === 400
        ? "That e-mail and password do not match an account. Check both, or reset the password."
        : await authErrorMessage(response, "Sign-in failed. Try again.");
    if (response.status === 429) return data({ errors: { form: message } as FieldErrors, email: parsed.data.email }, { status: 429, headers: retryAfterHeaders(response) });
    return data({ errors: { form: message } as FieldErrors, email: parsed.data.email }, { status: 400 });
  }
  throw redirect(safeNext(form.next, config().APP_URL), { headers: cookiesFrom(response) });
}

export default function SignIn() {
  const result = useActionData<typeof action>();
  const [params] = useSearchParams();
  const busy = useNavigation().state !== "idle";
  return (
    <AuthFrame
      title="Sign in"
      lead="Your team's calc sheets, checks and project documents."
      footer={
        <>
          New to Sinewright?{" "}
          <Link className="font-medium text-copper-deep underline" to={`/sign-up${params.get("next") ? `?next=${encodeURIComponent(params.get("next")!)}` : ""}`}>
            Create an account
          </Link>
        </>
      }
    >
      {params.get("reset") === "done" ? (
        <div className="mb-4">
          <Notice tone="success">Your password is changed. Sign in with the new one.</Notice>
        </div>
      ) : null}
      <Form method="post" className="space-y-4" noValidate>
        <FormError message={result?.errors.form} />
        <input type="hidden" name="next" value={params.get("next") ?? ""} />
        <TextField name="email" type="email" label="E-mail" autoComplete="email" defaultValue={result?.email} error={result?.errors.email} required />
        <TextField name="password" type="password" label="Password" autoComplete="current-password" error={result?.errors.password} required />
        <div className="flex items-center justify-between gap-4 pt-2">
          <Link to="/forgot-password" className="text-sm text-ink-soft underline">
            Forgot the password?
          </Link>
          <button type="submit" className="btn btn-primary" disabled={busy}>
            {busy ? "Signing in…" : "Sign in"}
          </button>
        </div>
      </Form>
    </AuthFrame>
  );
}
