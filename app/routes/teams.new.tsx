import { data, Form, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import type { Route } from "./+types/teams.new";
import { FormError, TextField } from "~/components/form-fields";
import { fieldErrors, teamForm, type FieldErrors } from "~/lib/forms/account";
import { identityOf, requireUser } from "~/.server/access";
import { auth } from "~/.server/auth";
import { recordAudit } from "~/.server/audit";
import { slugify } from "~/.server/team";

export const meta: Route.MetaFunction = () => [{ title: "Start a team · Sinewright" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  await requireUser(request, context);
  return { hasTeam: Boolean((await identityOf(context))?.teams.length) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const user = await requireUser(request, context);
  const parsed = teamForm.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error) as FieldErrors }, { status: 400 });
  try {
    const team = await auth().api.createOrganization({ headers: request.headers, body: { name: parsed.data.name, slug: slugify(parsed.data.name) } });
    if (!team) throw new Error("no team returned");
    await auth().api.setActiveOrganization({ headers: request.headers, body: { organizationId: team.id } });
    await recordAudit({ teamId: team.id, actorId: user.id, action: "team.created", subjectType: "team", subjectId: team.id, detail: { name: team.name } });
  } catch {
    return data({ errors: { form: "The team could not be created. Try again in a moment." } as FieldErrors }, { status: 400 });
  }
  throw redirect("/sheets");
}

export default function NewTeam() {
  const { hasTeam } = useLoaderData<typeof loader>();
  const result = useActionData<typeof action>();
  const busy = useNavigation().state !== "idle";
  return (
    <div className="mx-auto max-w-lg">
      <p className="eyebrow">Team</p>
      <h1 className="mt-1 font-serif text-3xl font-semibold">Start a team</h1>
      <p className="mt-3 text-ink-soft">
        {hasTeam
          ? "You can belong to several teams and switch between them; nothing of one team is visible to another."
          : "You are not in a team yet. If a colleague invited you, open the link in their e-mail instead. Otherwise, start your team here; you will be its first admin."}
      </p>
      <Form method="post" className="panel mt-6 space-y-4 p-6" noValidate>
        <FormError message={result?.errors.form} />
        <TextField name="name" label="Team name" placeholder="e.g. Drives & Inverters Group" error={result?.errors.name} required />
        <div className="flex justify-end">
          <button className="btn btn-primary" type="submit" disabled={busy}>
            Create the team
          </button>
        </div>
      </Form>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
