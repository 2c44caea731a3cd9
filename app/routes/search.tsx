import { useEffect, useRef, useState } from "react";
import { Form, Link, useFetcher, useLoaderData, useSearchParams } from "react-router";
import type { Route } from "./+types/search";
import { EmptyState, PageHeader } from "~/components/empty-state";
import { Notice, SelectField } from "~/components/form-fields";
import { StatusBadge } from "~/components/status-badge";
import { calculators } from "~/lib/calc/registry";
import { blockQuery, SEARCH_QUERY_MAX_LENGTH, searchQuery } from "~/lib/forms/search";
import { sheetNumberLabel } from "~/lib/sheets/numbering";
import { requireMember } from "~/.server/access";
import { listProjects } from "~/.server/projects";
import { BlockQueryError } from "~/.server/search";
import { BlockSearchInputError, hitView, runBlockSearch, runSearch } from "~/.server/search-query";
import { sheetAuthors } from "~/.server/sheets";
import type { loader as apiLoader } from "./api.v1.search";

export const meta: Route.MetaFunction = () => [{ title: "Search · Sinewright" }];

/** A hit as the API sends it (sheets and project documents). */
type Hit = ReturnType<typeof hitView>;

export async function loader({ request, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const params = Object.fromEntries(new URL(request.url).searchParams);
  const parsedQuery = searchQuery.safeParse(params);
  // An over-long query is not run: the page says what to change and keeps the words typed.
  const query = parsedQuery.success ? parsedQuery.data : { ...searchQuery.parse({}), q: String(params.q ?? "") };
  const queryError = parsedQuery.success ? null : (parsedQuery.error.issues[0]?.message ?? "Check the search words.");
  const [result, projects, authors] = await Promise.all([
    parsedQuery.success ? runSearch(me, query) : null,
    listProjects(me.team.teamId),
    sheetAuthors(me.team.teamId),
  ]);
  let blocks: { hits: Awaited<ReturnType<typeof runBlockSearch>>; error: string | null } | null = null;
  if (params.mode === "blocks") {
    const parsed = blockQuery.safeParse(params);
    if (!parsed.success) blocks = { hits: [], error: parsed.error.issues[0]?.message ?? "Check the block query." };
    else {
      try {
        blocks = { hits: await runBlockSearch(me, parsed.data), error: null };
      } catch (error) {
        if (!(error instanceof BlockSearchInputError || error instanceof BlockQueryError)) throw error;
        blocks = { hits: [], error: error.message };
      }
    }
  }
  const hits: Hit[] = result?.hits.map(hitView) ?? [];
  return {
    teamName: me.team.teamName,
    query,
    hits,
    total: result?.total ?? 0,
    notice: result?.notice ?? null,
    queryError,
    projects: projects.map((p) => ({ id: p.id, label: `${p.code} — ${p.name}` })),
    authors,
    calculators: calculators.map((c) => ({ id: c.id, title: c.title, fields: [...c.inputs.filter((i) => i.kind === "quantity").map((i) => ({ key: i.key, label: `input ${i.key} — ${i.label}`, of: "inputs" })), ...c.outputs.filter((o) => o.kind === "scalar").map((o) => ({ key: o.key, label: `result ${o.key} — ${o.label}`, of: "results" }))] })),
    blocks: blocks ? { error: blocks.error, hits: blocks.hits.map((b) => ({ sheet: sheetNumberLabel(b.sheetNumber), title: b.title, revision: b.revisionLabel, state: b.state, block: b.blockId, values: b.values })) } : null,
  };
}

function Snippet({ parts }: { parts: { text: string; hit: boolean }[] }) {
  return (
    <p className="mt-1 text-sm text-ink-soft">
      {parts.map((part, i) => (part.hit ? <mark key={i} className="rounded bg-copper-wash px-0.5 text-ink">{part.text}</mark> : <span key={i}>{part.text}</span>))}
    </p>
  );
}

export default function Search() {
  const data = useLoaderData<typeof loader>();
  const [params] = useSearchParams();
  const live = useFetcher<typeof apiLoader>();
  const [text, setText] = useState(data.query.q);
  const box = useRef<HTMLInputElement>(null);
  const [calculator, setCalculator] = useState(params.get("calculator") ?? "lc-filter");

  // Search as you type: ask the JSON API for the current words (filters kept from the page).
  useEffect(() => {
    if (text === data.query.q) return;
    const timer = setTimeout(() => {
      const next = new URLSearchParams(params);
      next.set("q", text);
      next.delete("mode");
      live.load(`/api/v1/search?${next.toString()}`);
    }, 200);
    return () => clearTimeout(timer);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [text]);

  useEffect(() => {
    if (params.get("focus") === "1") box.current?.focus();
  }, [params]);

  const liveData = live.data as { hits: Hit[]; total: number; notice: string | null } | { error: string } | undefined;
  const showing =
    text !== data.query.q && liveData
      ? "error" in liveData
        ? { hits: [], total: 0, notice: null, error: liveData.error }
        : { ...liveData, error: null }
      : { hits: data.hits, total: data.total, notice: data.notice, error: data.queryError };
  const fields = data.calculators.find((c) => c.id === calculator)?.fields ?? [];

  return (
    <>
      <PageHeader eyebrow={data.teamName} title="Search" />
      <Form method="get" role="search" className="panel space-y-3 p-4">
        <div>
          <label htmlFor="search-box" className="field-label">
            Search sheets and documents <span className="font-normal text-ink-faint">— press / anywhere to come here</span>
          </label>
          <input
            ref={box}
            id="search-box"
            name="q"
            type="search"
            value={text}
            onChange={(e) => setText(e.target.value)}
            placeholder='e.g. fsw 20 kHz, quasi-square 48 V, "dc link" -draft'
            className="field-input"
            autoComplete="off"
            maxLength={SEARCH_QUERY_MAX_LENGTH}
            aria-invalid={showing.error ? true : undefined}
            aria-describedby={showing.error ? "search-error" : undefined}
          />
          {showing.error ? (
            <p id="search-error" className="field-error">
              {showing.error}
            </p>
          ) : null}
        </div>
        <div className="flex flex-wrap items-end gap-3">
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" name="verified" value="1" defaultChecked={Boolean(data.query.verified)} /> Verified only
          </label>
          <SelectField name="project" label="Project" anyLabel="Any" defaultValue={data.query.project} options={data.projects.map((p) => ({ value: p.id, label: p.label }))} />
          <SelectField name="calculator" label="Calculator" anyLabel="Any" defaultValue={data.query.calculator} options={data.calculators.map((c) => ({ value: c.id, label: c.title }))} />
          <SelectField name="author" label="Author" anyLabel="Anyone" defaultValue={data.query.author} options={data.authors.map((a) => ({ value: a.id, label: a.name }))} />
          <div>
            <label htmlFor="search-from" className="field-label">
              Changed since
            </label>
            <input id="search-from" name="from" type="date" defaultValue={data.query.from ?? ""} className="field-input" />
          </div>
          <button type="submit" className="btn btn-primary">
            Search
          </button>
        </div>
      </Form>

      {showing.notice ? (
        <div className="mt-4">
          <Notice tone="caution">{showing.notice}</Notice>
        </div>
      ) : null}

      <section aria-labelledby="results-heading" aria-live="polite" className="mt-6">
        <h2 id="results-heading" className="sr-only">
          Results
        </h2>
        {text === "" ? (
          <EmptyState title="Find past calculations">
            Words from titles, prose and tags; project codes; calculator names such as <code>lc-filter</code>; and the values of inputs and
            results, typed as you would write them: <code>fsw 20 kHz</code>, <code>quasi-square 48 V</code>.
          </EmptyState>
        ) : showing.error ? null : showing.hits.length === 0 ? (
          <EmptyState title="Nothing matches">Try fewer words, another spelling of a value, or clear the filters.</EmptyState>
        ) : (
          <>
            <p className="text-sm text-ink-faint">
              {showing.total} {showing.total === 1 ? "result" : "results"}
            </p>
            <ol className="mt-2 space-y-3">
              {showing.hits.map((hit) => (
                <li key={hit.url ?? `${hit.sheet ?? hit.document}-${hit.revision}`} className="panel p-4">
                  <div className="flex flex-wrap items-center gap-2">
                    <span className="font-mono text-sm text-ink-faint">{hit.sheet ?? hit.document}</span>
                    {hit.url ? (
                      <Link to={hit.url} className="font-medium">
                        {hit.title}
                      </Link>
                    ) : (
                      <span className="font-medium">{hit.title}</span>
                    )}
                    {hit.kind === "document" ? (
                      <span className="rounded-full border border-rule-strong px-2 py-0.5 text-xs text-ink-soft">{`Project document · version ${hit.revision ?? "—"}`}</span>
                    ) : (
                      <StatusBadge status={hit.state} />
                    )}
                    {hit.project ? <span className="text-xs text-ink-faint">{hit.project}</span> : null}
                  </div>
                  <Snippet parts={hit.snippet} />
                </li>
              ))}
            </ol>
          </>
        )}
      </section>

      <section aria-labelledby="blocks-heading" className="panel mt-10 p-5">
        <h2 id="blocks-heading" className="font-semibold">
          Find blocks by value
        </h2>
        <p className="mt-1 text-sm text-ink-soft">Every block of a calculator whose input or result lies in a range, in the latest revision of each sheet.</p>
        <Form method="get" className="mt-4 grid gap-3 sm:grid-cols-2 lg:grid-cols-[repeat(4,1fr)_auto_auto]">
          <input type="hidden" name="mode" value="blocks" />
          <div>
            <label htmlFor="blocks-calculator" className="field-label">
              Calculator
            </label>
            <select id="blocks-calculator" name="calculator" value={calculator} onChange={(e) => setCalculator(e.target.value)} className="field-input">
              {data.calculators.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.title}
                </option>
              ))}
            </select>
          </div>
          <div>
            <label htmlFor="blocks-field" className="field-label">
              Value
            </label>
            <select id="blocks-field" name="field" defaultValue={params.get("field") ?? "f0"} className="field-input" onChange={(e) => {
              const of = fields.find((f) => f.key === e.target.value)?.of ?? "results";
              const hidden = e.currentTarget.form?.elements.namedItem("of") as HTMLInputElement | null;
              if (hidden) hidden.value = of;
            }}>
              {fields.map((f) => (
                <option key={`${f.of}-${f.key}`} value={f.key}>
                  {f.label}
                </option>
              ))}
            </select>
            <input type="hidden" name="of" defaultValue={params.get("of") ?? "results"} />
          </div>
          <div>
            <label htmlFor="blocks-min" className="field-label">
              From
            </label>
            <input id="blocks-min" name="min" defaultValue={params.get("min") ?? ""} placeholder="1 kHz" className="field-input" />
          </div>
          <div>
            <label htmlFor="blocks-max" className="field-label">
              To
            </label>
            <input id="blocks-max" name="max" defaultValue={params.get("max") ?? ""} placeholder="3 kHz" className="field-input" />
          </div>
          <label className="flex items-end gap-2 pb-2 text-sm">
            <input type="checkbox" name="verified" value="1" defaultChecked={params.get("mode") === "blocks" && Boolean(params.get("verified"))} /> Verified only
          </label>
          <div className="flex items-end">
            <button type="submit" className="btn btn-quiet">
              Find blocks
            </button>
          </div>
        </Form>
        {data.blocks?.error ? <p className="field-error mt-3">{data.blocks.error}</p> : null}
        {data.blocks && !data.blocks.error ? (
          data.blocks.hits.length === 0 ? (
            <p className="mt-4 text-sm text-ink-faint">No block has a value in that range.</p>
          ) : (
            <ul className="mt-4 divide-y divide-rule text-sm">
              {data.blocks.hits.map((b) => (
                <li key={`${b.sheet}-${b.block}`} className="flex flex-wrap items-center gap-3 py-2">
                  <Link to={`/sheets/${b.sheet}/revisions/${b.revision}`} className="font-mono">
                    {`${b.sheet} rev ${b.revision} · ${b.block}`}
                  </Link>
                  <span className="flex-1">{b.title}</span>
                  <span className="font-mono text-xs">{Object.entries(b.values).map(([k, v]) => `${k} = ${v.toPrecision(4)}`).join(", ")}</span>
                  <StatusBadge status={b.state} />
                </li>
              ))}
            </ul>
          )
        ) : null}
      </section>
    </>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/route-error";
