import { data, Form, Link, redirect, useActionData, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/sign-up";
import { AuthFrame } from "~/components/auth-frame";
import { FormError, TextField } from "~/components/form-fields";
import { fieldErrors, safeNext, signUpForm, type FieldErrors } from "~/lib/forms/account";
import { identityOf } from "~/.server/access";
import { callAuthEndpoint } from "~/.server/auth";
import { actionRetryAfter, authErrorMessage, cookiesFrom, retryAfterHeaders } from "~/.server/auth-response";

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
  const response = await callAuthEndpoint(request, "/sign-up/email", parsed.data);
  if (!response.ok) {
    const message = await authErrorMessage(response, "The account could not be created.");
    if (response.status === 429) return data({ errors: { form: message } as FieldErrors, ...echo }, { status: 429, headers: retryAfterHeaders(response) });
    const taken = /exist/i.test(message);
    return data(
      { errors: (taken ? { email: "An account with this e-mail already exists. Sign in instead, or reset its password." } : { form: message }) as FieldErrors, ...echo },
      { status: 400 },
    );
  }
  // A new account has no team yet: it either accepts an invitation (next) or starts a team.
  throw redirect(safeNext(form.next, "/teams/new"), { headers: cookiesFrom(response) });
}

export default function SignUp() {
  const result = useActionData<typeof action>();
  const [params] = useSearchParams();
  const busy = useNavigation().state !== "idle";
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
        <FormError message={result?.errors.form} />
        <input type="hidden" name="next" value={params.get("next") ?? ""} />
        <TextField name="name" label="Name" autoComplete="name" defaultValue={result?.name} error={result?.errors.name} required />
        <TextField name="email" type="email" label="E-mail" autoComplete="email" defaultValue={result?.email} error={result?.errors.email} required />
        <TextField name="password" type="password" label="Password" autoComplete="new-password" hint="At least 10 characters." error={result?.errors.password} required />
        <div className="flex justify-end pt-2">
          <button type="submit" className="btn btn-primary" disabled={busy}>
            {busy ? "Creating…" : "Create account"}
          </button>
        </div>
      </Form>
    </AuthFrame>
  );
}
