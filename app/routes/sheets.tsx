import { Form, Link, useLoaderData, useSearchParams } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/sheets";
import { EmptyState, PageHeader } from "~/components/empty-state";
import { SelectField } from "~/components/form-fields";
import { StatusBadge, statusLabel } from "~/components/status-badge";
import { calculators } from "~/lib/calc/registry";
import { requireMember } from "~/.server/access";
import { listProjects } from "~/.server/projects";
import { listSheets, sheetAuthors, SHEET_STATUSES } from "~/.server/sheets";

export const meta: Route.MetaFunction = () => [{ title: "Sheets · Sinewright" }];

const PAGE_SIZE = 20;
const listQuery = z.object({
  status: z.enum(SHEET_STATUSES).optional().catch(undefined),
  project: z.string().optional().catch(undefined),
  calculator: z.string().optional().catch(undefined),
  author: z.string().optional().catch(undefined),
  sort: z.enum(["number", "title", "updated", "status"]).catch("updated"),
  dir: z.enum(["asc", "desc"]).catch("desc"),
  page: z.coerce.number().int().min(1).catch(1),
});

export async function loader({ request, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const params = Object.fromEntries([...new URL(request.url).searchParams].filter(([, v]) => v !== ""));
  const query = listQuery.parse(params);
  const [{ rows, total }, projects, authors] = await Promise.all([
    listSheets(me.team.teamId, {
      status: query.status,
      projectId: query.project,
      calculator: query.calculator,
      authorId: query.author,
      sort: query.sort,
      direction: query.dir,
      page: query.page,
      pageSize: PAGE_SIZE,
    }),
    listProjects(me.team.teamId),
    sheetAuthors(me.team.teamId),
  ]);
  return {
    teamName: me.team.teamName,
    canWrite: me.team.role !== "viewer",
    rows,
    total,
    query,
    pages: Math.max(1, Math.ceil(total / PAGE_SIZE)),
    projects: projects.map((p) => ({ id: p.id, label: `${p.code} — ${p.name}` })),
    authors,
    calculators: calculators.map((c) => ({ id: c.id, title: c.title })),
    filtered: Boolean(query.status || query.project || query.calculator || query.author),
  };
}

const COLUMNS = [
  { key: "number", label: "Number" },
  { key: "title", label: "Title" },
  { key: "status", label: "State" },
  { key: "updated", label: "Updated" },
] as const;

export default function Sheets() {
  const data = useLoaderData<typeof loader>();
  const [params] = useSearchParams();
  const withParams = (changes: Record<string, string>) => {
    const next = new URLSearchParams(params);
    for (const [k, v] of Object.entries(changes)) next.set(k, v);
    return `?${next.toString()}`;
  };
  const sortLink = (key: string) => withParams({ sort: key, dir: data.query.sort === key && data.query.dir === "asc" ? "desc" : "asc", page: "1" });
  const ariaSort = (key: string) => (data.query.sort === key ? (data.query.dir === "asc" ? "ascending" : "descending") : undefined);

  return (
    <>
      <PageHeader eyebrow={data.teamName} title="Calc sheets">
        {data.canWrite ? (
          <Link to="/sheets/new" className="btn btn-primary">
            New sheet
          </Link>
        ) : null}
      </PageHeader>

      <Form method="get" className="panel mb-4 grid gap-3 p-4 sm:grid-cols-2 lg:grid-cols-[repeat(4,1fr)_auto]" aria-label="Filter sheets">
        <SelectField name="status" label="State" anyLabel="Any" defaultValue={data.query.status} options={SHEET_STATUS_OPTIONS.map((v) => ({ value: v, label: statusLabel(v) }))} />
        <SelectField name="project" label="Project" anyLabel="Any" defaultValue={data.query.project} options={[{ value: "library", label: "Team library (no project)" }, ...data.projects.map((p) => ({ value: p.id, label: p.label }))]} />
        <SelectField name="calculator" label="Uses calculator" anyLabel="Any" defaultValue={data.query.calculator} options={data.calculators.map((c) => ({ value: c.id, label: c.title }))} />
        <SelectField name="author" label="Author" anyLabel="Anyone" defaultValue={data.query.author} options={data.authors.map((a) => ({ value: a.id, label: a.name }))} />
        <input type="hidden" name="sort" value={data.query.sort} />
        <input type="hidden" name="dir" value={data.query.dir} />
        <div className="flex items-end gap-2">
          <button type="submit" className="btn btn-quiet">
            Apply
          </button>
          {data.filtered ? (
            <Link to="/sheets" className="btn btn-quiet">
              Clear
            </Link>
          ) : null}
        </div>
      </Form>

      {data.rows.length === 0 ? (
        data.filtered ? (
          <EmptyState title="No sheet matches these filters">Loosen a filter, or clear them all.</EmptyState>
        ) : (
          <EmptyState
            title="No calc sheets in this team yet"
            action={
              data.canWrite ? (
                <Link className="btn btn-primary" to="/sheets/new">
                  Write the first sheet
                </Link>
              ) : undefined
            }
          >
            A calc sheet holds one design calculation — prose, math and live calculators — with every input and result stored per
            revision, so a checker can verify it and project documents can cite it.
          </EmptyState>
        )
      ) : (
        <>
          {/* On a phone each sheet is a card: a table this wide would scroll sideways inside itself. */}
          <div className="sm:hidden">
            <nav aria-label="Sort sheets" className="mb-2 flex flex-wrap items-baseline gap-x-3 gap-y-1 text-sm text-ink-faint">
              <span>Sort by</span>
              {COLUMNS.map((c) => (
                <Link key={c.key} to={sortLink(c.key)} aria-current={data.query.sort === c.key ? "true" : undefined} className={data.query.sort === c.key ? "font-medium text-ink" : "hover:text-ink"}>
                  {c.label}
                  {data.query.sort === c.key ? <span aria-hidden="true">{data.query.dir === "asc" ? " ▲" : " ▼"}</span> : null}
                </Link>
              ))}
            </nav>
            <ul className="panel m-0 list-none divide-y divide-rule p-0">
              {data.rows.map((row) => (
                <li key={row.id} className="px-4 py-3">
                  <div className="flex items-center justify-between gap-2">
                    <span className="font-mono text-sm">
                      {row.label}
                      {row.latestLabel ? <span className="text-ink-faint"> · {row.latestLabel}</span> : null}
                    </span>
                    <StatusBadge status={row.status} />
                  </div>
                  <Link to={`/sheets/${row.label}`} className="mt-1 block font-medium">
                    {row.title}
                  </Link>
                  <p className="m-0 mt-1 text-xs text-ink-faint">
                    {[row.projectCode ?? "library", new Date(row.updatedAt).toISOString().slice(0, 10), row.authorName, row.tags.join(" · ")].filter(Boolean).join(" — ")}
                  </p>
                </li>
              ))}
            </ul>
          </div>
        <div className="panel hidden overflow-x-auto sm:block">
          <table className="w-full min-w-[44rem] text-left text-sm">
            <caption className="sr-only">
              Calc sheets, {data.total} in all, sorted by {data.query.sort} {data.query.dir === "asc" ? "ascending" : "descending"}
            </caption>
            <thead className="border-b border-rule text-ink-faint">
              <tr>
                {COLUMNS.map((c) => (
                  <th key={c.key} scope="col" aria-sort={ariaSort(c.key)} className="px-4 py-2 font-medium">
                    <Link to={sortLink(c.key)} className="no-underline hover:text-ink">
                      {c.label}
                      {data.query.sort === c.key ? <span aria-hidden="true">{data.query.dir === "asc" ? " ▲" : " ▼"}</span> : null}
                    </Link>
                  </th>
                ))}
                <th scope="col" className="px-4 py-2 font-medium">
                  Project
                </th>
                <th scope="col" className="px-4 py-2 font-medium">
                  Calculators
                </th>
              </tr>
            </thead>
            <tbody>
              {data.rows.map((row) => (
                <tr key={row.id} className="border-b border-rule align-top last:border-0 hover:bg-paper/60">
                  <td className="whitespace-nowrap px-4 py-2.5 font-mono">
                    <Link to={`/sheets/${row.label}`}>{row.label}</Link>
                    {row.latestLabel ? <span className="text-ink-faint"> · {row.latestLabel}</span> : null}
                  </td>
                  <td className="px-4 py-2.5">
                    <Link to={`/sheets/${row.label}`} className="font-medium no-underline hover:underline">
                      {row.title}
                    </Link>
                    {row.tags.length > 0 ? <span className="block text-xs text-ink-faint">{row.tags.join(" · ")}</span> : null}
                  </td>
                  <td className="px-4 py-2.5">
                    <StatusBadge status={row.status} />
                  </td>
                  <td className="whitespace-nowrap px-4 py-2.5 text-ink-soft">
                    {new Date(row.updatedAt).toISOString().slice(0, 10)}
                    {row.authorName ? <span className="block text-xs text-ink-faint">{row.authorName}</span> : null}
                  </td>
                  <td className="whitespace-nowrap px-4 py-2.5 text-ink-soft">{row.projectCode ?? <span className="text-ink-faint">library</span>}</td>
                  <td className="px-4 py-2.5 text-xs text-ink-soft">{row.calculators.join(", ")}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        </>
      )}
      {data.pages > 1 ? (
        <nav aria-label="Pages" className="mt-4 flex items-center justify-between text-sm">
          <span className="text-ink-faint">
            Page {data.query.page} of {data.pages} · {data.total} sheets
          </span>
          <span className="flex gap-2">
            {data.query.page > 1 ? (
              <Link className="btn btn-quiet" to={withParams({ page: String(data.query.page - 1) })}>
                Previous
              </Link>
            ) : null}
            {data.query.page < data.pages ? (
              <Link className="btn btn-quiet" to={withParams({ page: String(data.query.page + 1) })}>
                Next
              </Link>
            ) : null}
          </span>
        </nav>
      ) : null}
    </>
  );
}

const SHEET_STATUS_OPTIONS = ["unsaved", "draft", "submitted", "returned", "verified"] as const;

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
