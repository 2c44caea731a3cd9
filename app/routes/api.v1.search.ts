import type { Route } from "./+types/api.v1.search";
import { searchQuery } from "~/lib/forms/search";
import { requireMember } from "~/.server/access";
import { methodNotAllowed, readQuery } from "~/.server/api";
import { hitView, runSearch } from "~/.server/search-query";

/** GET /api/v1/search?q=… — the team's sheets ranked for the query, with highlighted snippets as data. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const query = readQuery(request, searchQuery);
  const result = await runSearch(me, query);
  if (!result) return Response.json({ query: "", hits: [], total: 0, engine: null });
  return Response.json({
    query: query.q,
    engine: result.engine,
    notice: result.notice ?? null,
    total: result.total,
    totalIsEstimate: result.totalIsEstimate,
    hits: result.hits.map(hitView),
  });
}

export async function action({ request, context }: Route.ActionArgs) {
  await requireMember(request, context, "viewer");
  return methodNotAllowed("GET");
}
