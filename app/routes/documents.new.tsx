import { data, Form, redirect, useActionData, useLoaderData, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/documents.new";
import { EmptyState, PageHeader } from "~/components/empty-state";
import { FormError, SelectField, TextField } from "~/components/form-fields";
import { fieldErrors, type FieldErrors } from "~/lib/forms/account";
import { documentDetailsForm } from "~/lib/forms/sheets";
import { requireMember } from "~/.server/access";
import { createDocument, DocumentRuleError } from "~/.server/documents";
import { listProjects } from "~/.server/projects";

export const meta: Route.MetaFunction = () => [{ title: "New project document · Sinewright" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "engineer");
  const projects = await listProjects(me.team.teamId);
  return { projects: projects.map((p) => ({ value: p.id, code: p.code, label: `${p.code} — ${p.name}` })) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const me = await requireMember(request, context, "engineer");
  const parsed = documentDetailsForm.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error) as FieldErrors }, { status: 400 });
  try {
    const document = await createDocument(me, parsed.data);
    throw redirect(`/documents/${document.label}/edit`);
  } catch (error) {
    if (error instanceof DocumentRuleError) return data({ errors: { projectId: error.message } as FieldErrors }, { status: 400 });
    throw error;
  }
}

export default function NewDocument() {
  const { projects } = useLoaderData<typeof loader>();
  const result = useActionData<typeof action>();
  const [params] = useSearchParams();
  const busy = useNavigation().state !== "idle";
  const preselected = projects.find((p) => p.code === params.get("project"))?.value ?? "";
  return (
    <div className="mx-auto max-w-2xl">
      <PageHeader eyebrow="Project documents" title="New project document" />
      {projects.length === 0 ? (
        <EmptyState title="No project yet">A document belongs to a project. Create the project first on the Projects page.</EmptyState>
      ) : (
        <Form method="post" className="panel space-y-4 p-6" noValidate>
          <p className="text-sm text-ink-soft">
            A design report, review pack or certification file. It cites checked calc-sheet revisions and shows when a citation goes stale.
          </p>
          <FormError message={result?.errors.form} />
          <TextField name="title" label="Title" placeholder="e.g. Design report, output stage" error={result?.errors.title} required />
          <SelectField name="projectId" label="Project" options={projects} defaultValue={preselected} anyLabel="Choose a project" error={result?.errors.projectId} />
          <div className="flex justify-end">
            <button type="submit" className="btn btn-primary" disabled={busy}>
              Create and start writing
            </button>
          </div>
        </Form>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
