import { data, Form, Link, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import type { Route } from "./+types/projects.$code";
import { EmptyState, PageHeader } from "~/components/empty-state";
import { FormError, Notice, TextField } from "~/components/form-fields";
import { StaleCitationList } from "~/components/citations";
import { StatusBadge } from "~/components/status-badge";
import { fieldErrors, type FieldErrors } from "~/lib/forms/account";
import { citationUpdateForm, projectForm } from "~/lib/forms/sheets";
import { requireMember } from "~/.server/access";
import { DocumentRuleError, listProjectDocuments, staleCitations, updateCitation } from "~/.server/documents";
import { getProjectByCode, ProjectRuleError, updateProject } from "~/.server/projects";
import { listSheets } from "~/.server/sheets";

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `${data.project.code} ${data.project.name} · Sinewright` : "Project · Sinewright" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const project = await getProjectByCode(me.team.teamId, params.code);
  if (!project) throw new Response(null, { status: 404 });
  const [{ rows }, documents, stale] = await Promise.all([
    listSheets(me.team.teamId, { projectId: project.id, sort: "number", direction: "asc", page: 1, pageSize: 500 }),
    listProjectDocuments(me.team.teamId, project.id),
    staleCitations(me.team.teamId, project.id),
  ]);
  return {
    canWrite: me.team.role !== "viewer",
    project: { id: project.id, code: project.code, name: project.name, client: project.client, description: project.description },
    sheets: rows,
    documents: documents.map((d) => ({ id: d.id, label: d.label, title: d.title, version: d.version, authorName: d.authorName, updatedAt: d.updatedAt.toISOString() })),
    stale,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const me = await requireMember(request, context, "engineer");
  const project = await getProjectByCode(me.team.teamId, params.code);
  if (!project) throw new Response(null, { status: 404 });
  const form = Object.fromEntries(await request.formData());
  if (form.intent === "update-citation") {
    const citation = citationUpdateForm.safeParse(form);
    if (!citation.success) return data({ errors: { citation: citation.error.issues[0]?.message ?? "The form was incomplete." } as FieldErrors, saved: false, updated: null }, { status: 400 });
    try {
      const updated = await updateCitation(me, citation.data.documentId, citation.data);
      return { errors: {} as FieldErrors, saved: false, updated: `${updated.document} now cites ${updated.sheet} rev ${updated.to} (was ${updated.from}); saved as version ${updated.version}.` };
    } catch (error) {
      if (error instanceof DocumentRuleError) return data({ errors: { citation: error.message } as FieldErrors, saved: false, updated: null }, { status: 400 });
      throw error;
    }
  }
  const parsed = projectForm.safeParse(form);
  if (!parsed.success) return data({ errors: fieldErrors(parsed.error) as FieldErrors, saved: false, updated: null }, { status: 400 });
  try {
    const updated = await updateProject(me, project.id, parsed.data);
    if (updated.code !== project.code) throw redirect(`/projects/${updated.code}`);
    return { errors: {} as FieldErrors, saved: true, updated: null };
  } catch (error) {
    if (error instanceof ProjectRuleError) return data({ errors: { [error.field ?? "form"]: error.message } as FieldErrors, saved: false, updated: null }, { status: 400 });
    throw error;
  }
}

export default function ProjectPage() {
  const { canWrite, project, sheets, documents, stale } = useLoaderData<typeof loader>();
  const result = useActionData<typeof action>();
  const navigation = useNavigation();
  const busy = navigation.state !== "idle";
  const busyKey = navigation.formData?.get("intent") === "update-citation" ? `${String(navigation.formData.get("documentId"))}:${String(navigation.formData.get("sheet"))}@${String(navigation.formData.get("rev"))}` : null;
  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-2 text-sm text-ink-faint">
        <Link to="/projects">Projects</Link> <span aria-hidden="true">/</span> <span className="font-mono">{project.code}</span>
      </nav>
      <PageHeader eyebrow={project.code} title={project.name}>
        {canWrite ? (
          <>
            <Link to={`/sheets/new?project=${project.code}`} className="btn btn-primary">
              New sheet in this project
            </Link>
            <Link to={`/documents/new?project=${project.code}`} className="btn btn-quiet">
              New document
            </Link>
          </>
        ) : null}
      </PageHeader>
      {project.client ? <p className="text-ink-soft">Client: {project.client}</p> : null}
      {project.description ? <p className="mt-2 max-w-3xl whitespace-pre-line text-ink-soft">{project.description}</p> : null}
      <section aria-labelledby="stale-citations" className="mt-6">
        <h2 id="stale-citations" className="mb-3 font-semibold">
          Citations needing attention
        </h2>
        {result?.updated ? <Notice tone="success">{result.updated}</Notice> : null}
        <FormError message={result?.errors.citation} />
        {stale.length === 0 ? (
          <p className="panel px-4 py-3 text-sm text-ink-soft">
            {documents.length === 0 ? "No project documents yet." : "Every citation in this project's documents points at a verified revision that is still current."}
          </p>
        ) : (
          <div className="panel border-[#e3cf8f]">
            <StaleCitationList rows={stale} canUpdate={canWrite} showDocument busyKey={busyKey} />
          </div>
        )}
      </section>
      <section aria-labelledby="project-documents" className="mt-6">
        <h2 id="project-documents" className="mb-3 font-semibold">
          Documents
        </h2>
        {documents.length === 0 ? (
          <EmptyState title="No documents in this project yet">Design reports, review packs and certification files that cite this project's checked sheets are listed here.</EmptyState>
        ) : (
          <ul className="panel divide-y divide-rule">
            {documents.map((d) => (
              <li key={d.id} className="flex flex-col gap-1 px-4 py-3 sm:flex-row sm:items-center sm:gap-4">
                <Link to={`/documents/${d.label}`} className="w-24 font-mono">
                  {d.label}
                </Link>
                <span className="flex-1">{d.title}</span>
                <span className="font-mono text-xs text-ink-faint">{d.version ? `version ${d.version}` : "not saved yet"}</span>
                <span className="text-xs text-ink-faint">{d.authorName ?? ""}</span>
              </li>
            ))}
          </ul>
        )}
      </section>
      <section aria-labelledby="project-sheets" className="mt-6">
        <h2 id="project-sheets" className="mb-3 font-semibold">
          Calc sheets
        </h2>
        {sheets.length === 0 ? (
          <EmptyState title="No sheets in this project yet">Sheets written for this project are listed here with their state.</EmptyState>
        ) : (
          <ul className="panel divide-y divide-rule">
            {sheets.map((s) => (
              <li key={s.id} className="flex flex-col gap-1 px-4 py-3 sm:flex-row sm:items-center sm:gap-4">
                <Link to={`/sheets/${s.label}`} className="w-24 font-mono">
                  {s.label}
                </Link>
                <span className="flex-1">{s.title}</span>
                <span className="font-mono text-xs text-ink-faint">{s.latestLabel ? `rev ${s.latestLabel}` : ""}</span>
                <StatusBadge status={s.status} />
              </li>
            ))}
          </ul>
        )}
      </section>
      {canWrite ? (
        <details className="panel mt-8 p-5">
          <summary className="cursor-pointer font-semibold">Edit project details</summary>
          <Form method="post" className="mt-4 grid gap-3 sm:grid-cols-2" noValidate>
            <div className="sm:col-span-2">
              <FormError message={result?.errors.form} />
              {result?.saved ? <Notice tone="success">Project details saved.</Notice> : null}
            </div>
            <TextField name="code" label="Code" defaultValue={project.code} error={result?.errors.code} />
            <TextField name="name" label="Name" defaultValue={project.name} error={result?.errors.name} />
            <TextField name="client" label="Client" defaultValue={project.client} error={result?.errors.client} />
            <div className="sm:col-span-2">
              <label htmlFor="project-description" className="field-label">
                Description
              </label>
              <textarea id="project-description" name="description" rows={3} className="field-input" defaultValue={project.description} />
            </div>
            <div>
              <button type="submit" className="btn btn-primary" disabled={busy}>
                Save details
              </button>
            </div>
          </Form>
        </details>
      ) : null}
    </>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
