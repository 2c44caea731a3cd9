import { data, Form, Link, redirect, useActionData, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/sign-up";
import { AuthFrame } from "~/components/auth-frame";
import { FormError, TextField } from "~/components/form-fields";
import { fieldErrors, safeNext, signUpForm, type FieldErrors } from "~/lib/forms/account";
import { identityOf } from "~/.server/access";
import { callAuthEndpoint } from "~/.server/auth";
import { config } from "~/.server/config";
import { actionRetryAfter, authErrorMessage, retryAfterHeaders } from "~/.server/auth-response";

export const headers = actionRetryAfter;
export const meta: Route.MetaFunction = () => [{ title: "Create an account · Sinewright" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  if (await identityOf(context)) throw redirect("/sheets");
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  const form = Object.fromEntries(await request.formData());
  const parsed = signUpForm.safeParse(form);
  const echo = { name: String(form.name ?? ""), email: String(form.email ?? "") };
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error) as FieldErrors, ...echo }, { status: 400 });
  // The link in the confirmation mail signs the new account in and continues where it was going (an invitation, or a new team).
  const callbackURL = safeNext(form.next, config().APP_URL, "/teams/new");
  const response = await callAuthEndpoint(request, "/sign-up/email", { ...parsed.data, callbackURL });
  if (!response.ok) {
    const message = await authErrorMessage(response, "The account could not be created.");
    if (response.status === 429) return data({ errors: { form: message } as FieldErrors, ...echo }, { status: 429, headers: retryAfterHeaders(response) });
    return data({ errors: { form: message } as FieldErrors, ...echo }, { status: 400 });
  }
  // The same answer whether or not the address already had an account (that owner is mailed a note instead).
  return { sentTo: parsed.data.email };
}

export default function SignUp() {
  const result = useActionData<typeof action>();
  const [params] = useSearchParams();
  const busy = useNavigation().state !== "idle";
  if (result && "sentTo" in result) {
    return (
      <AuthFrame title="Check your e-mail" lead={`We sent a message to ${result.sentTo}.`}>
        <p className="text-ink-soft">
          Open the link in it to confirm the address and sign in; it works for one day. No message after a few minutes? Look in the spam folder, or{" "}
          <Link className="font-medium text-copper-deep underline" to="/sign-in">
            sign in
          </Link>{" "}
          if you already have an account.
        </p>
      </AuthFrame>
    );
  }
  const errors = result && "errors" in result ? result : undefined;
  return (
    <AuthFrame
      title="Create an account"
      lead="Invited by a colleague? Use the e-mail address the invitation went to."
      footer={
        <>
          Already have an account?{" "}
          <Link className="font-medium text-copper-deep underline" to={`/sign-in${params.get("next") ? `?next=${encodeURIComponent(params.get("next")!)}` : ""}`}>
            Sign in
          </Link>
        </>
      }
    >
      <Form method="post" className="space-y-4" noValidate>
        <FormError message={errors?.errors.form} />
        <input type="hidden" name="next" value={params.get("next") ?? ""} />
        <TextField name="name" label="Name" autoComplete="name" defaultValue={errors?.name} error={errors?.errors.name} required />
        <TextField name="email" type="email" label="E-mail" autoComplete="email" defaultValue={errors?.email} error={errors?.errors.email} required />
        <TextField name="password" type="password" label="Password" autoComplete="new-password" hint="At least 10 characters." error={errors?.errors.password} required />
        <div className="flex justify-end pt-2">
          <button type="submit" className="btn btn-primary" disabled={busy}>
            {busy ? "Creating…" : "Create account"}
          </button>
        </div>
      </Form>
    </AuthFrame>
  );
}
