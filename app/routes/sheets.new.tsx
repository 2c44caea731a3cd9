import { data, Form, redirect, useActionData, useLoaderData, useNavigation, useSearchParams } from "react-router";
import type { Route } from "./+types/sheets.new";
import { PageHeader } from "~/components/empty-state";
import { FormError, TextField } from "~/components/form-fields";
import { fieldErrors, type FieldErrors } from "~/lib/forms/account";
import { sheetDetailsForm } from "~/lib/forms/sheets";
import { sheetNumberLabel } from "~/lib/sheets/numbering";
import { requireMember } from "~/.server/access";
import { listProjects } from "~/.server/projects";
import { createSheet, SheetRuleError } from "~/.server/sheets";

export const meta: Route.MetaFunction = () => [{ title: "New sheet · Sinewright" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "engineer");
  const projects = await listProjects(me.team.teamId);
  return { projects: projects.map((p) => ({ id: p.id, code: p.code, label: `${p.code} — ${p.name}` })) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const me = await requireMember(request, context, "engineer");
  const parsed = sheetDetailsForm.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error) as FieldErrors }, { status: 400 });
  try {
    const sheet = await createSheet(me, { title: parsed.data.title, projectId: parsed.data.projectId || null, tags: parsed.data.tags });
    throw redirect(`/sheets/${sheetNumberLabel(sheet.number)}/edit`);
  } catch (error) {
    if (error instanceof SheetRuleError) return data({ errors: { projectId: error.message } as FieldErrors }, { status: 400 });
    throw error;
  }
}

export default function NewSheet() {
  const { projects } = useLoaderData<typeof loader>();
  const result = useActionData<typeof action>();
  const [params] = useSearchParams();
  const busy = useNavigation().state !== "idle";
  const preselected = projects.find((p) => p.code === params.get("project"))?.id ?? "";
  return (
    <div className="mx-auto max-w-2xl">
      <PageHeader eyebrow="Calc sheets" title="New sheet" />
      <Form method="post" className="panel space-y-4 p-6" noValidate>
        <FormError message={result?.errors.form} />
        <TextField name="title" label="Title" placeholder="e.g. Output LC filter for the 3 kW pump inverter" error={result?.errors.title} required />
        <div>
          <label className="field-label" htmlFor="sheet-project">
            Project
          </label>
          <select id="sheet-project" name="projectId" defaultValue={preselected} className="field-input" aria-describedby={result?.errors.projectId ? "sheet-project-error" : undefined}>
            <option value="">Team library (no project)</option>
            {projects.map((p) => (
              <option key={p.id} value={p.id}>
                {p.label}
              </option>
            ))}
          </select>
          {result?.errors.projectId ? (
            <p id="sheet-project-error" className="field-error">
              {result.errors.projectId}
            </p>
          ) : null}
        </div>
        <TextField name="tags" label="Tags" placeholder="filter, 400 Hz, ground power" hint="Separate tags with commas." error={result?.errors.tags} />
        <div className="flex justify-end">
          <button type="submit" className="btn btn-primary" disabled={busy}>
            Create and start writing
          </button>
        </div>
      </Form>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
