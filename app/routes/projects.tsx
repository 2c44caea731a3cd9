import { data, Form, Link, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import type { Route } from "./+types/projects";
import { EmptyState, PageHeader } from "~/components/empty-state";
import { FormError, TextField } from "~/components/form-fields";
import { fieldErrors, type FieldErrors } from "~/lib/forms/account";
import { projectForm } from "~/lib/forms/sheets";
import { requireMember } from "~/.server/access";
import { createProject, listProjects, ProjectRuleError } from "~/.server/projects";

export const meta: Route.MetaFunction = () => [{ title: "Projects · Sinewright" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  return { teamName: me.team.teamName, canWrite: me.team.role !== "viewer", projects: await listProjects(me.team.teamId) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const me = await requireMember(request, context, "engineer");
  const form = Object.fromEntries(await request.formData());
  const parsed = projectForm.safeParse(form);
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error) as FieldErrors, values: form as Record<string, string> }, { status: 400 });
  try {
    const created = await createProject(me, parsed.data);
    throw redirect(`/projects/${created.code}`);
  } catch (error) {
    if (error instanceof ProjectRuleError) return data({ errors: { [error.field ?? "form"]: error.message } as FieldErrors, values: form as Record<string, string> }, { status: 400 });
    throw error;
  }
}

export default function Projects() {
  const { teamName, canWrite, projects } = useLoaderData<typeof loader>();
  const result = useActionData<typeof action>();
  const busy = useNavigation().state !== "idle";
  return (
    <>
      <PageHeader eyebrow={teamName} title="Projects" />
      <div className="grid gap-8 lg:grid-cols-[1fr_22rem]">
        <div>
          {projects.length === 0 ? (
            <EmptyState title="No projects yet">
              A project gathers the calc sheets and documents of one product or job — an off-grid inverter, a backup supply — with its
              client and code, so its design report can cite checked revisions.
            </EmptyState>
          ) : (
            <ul className="grid gap-3 sm:grid-cols-2">
              {projects.map((p) => (
                <li key={p.id} className="panel p-4">
                  <p className="font-mono text-xs text-ink-faint">{p.code}</p>
                  <h2 className="mt-0.5 font-serif text-lg font-semibold">
                    <Link to={`/projects/${p.code}`} className="no-underline hover:underline">
                      {p.name}
                    </Link>
                  </h2>
                  {p.client ? <p className="text-sm text-ink-soft">for {p.client}</p> : null}
                  <p className="mt-2 text-xs text-ink-faint">
                    {p.sheets} {p.sheets === 1 ? "sheet" : "sheets"}
                  </p>
                </li>
              ))}
            </ul>
          )}
        </div>
        {canWrite ? (
          <section aria-labelledby="new-project" className="panel self-start p-5">
            <h2 id="new-project" className="font-semibold">
              New project
            </h2>
            <Form method="post" className="mt-4 space-y-3" noValidate>
              <FormError message={result?.errors.form} />
              <TextField name="code" label="Code" placeholder="PUMP-3K" defaultValue={result?.values.code} error={result?.errors.code} required />
              <TextField name="name" label="Name" placeholder="3 kW pump inverter" defaultValue={result?.values.name} error={result?.errors.name} required />
              <TextField name="client" label="Client" defaultValue={result?.values.client} error={result?.errors.client} />
              <div>
                <label htmlFor="project-description" className="field-label">
                  Description
                </label>
                <textarea id="project-description" name="description" rows={3} className="field-input" defaultValue={result?.values.description} />
              </div>
              <button type="submit" className="btn btn-primary" disabled={busy}>
                Create the project
              </button>
            </Form>
          </section>
        ) : null}
      </div>
    </>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
