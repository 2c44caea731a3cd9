import type { Route } from "./+types/api.v1.blocks";
import { blockQuery } from "~/lib/forms/search";
import { sheetNumberLabel } from "~/lib/sheets/numbering";
import { requireMember } from "~/.server/access";
import { apiError, methodNotAllowed, readQuery, resultsJson } from "~/.server/api";
import { BlockQueryError } from "~/.server/search";
import { BlockSearchInputError, runBlockSearch } from "~/.server/search-query";

/** GET /api/v1/blocks?calculator=lc-filter&field=f0&min=1 kHz&max=3 kHz&verified=1 — blocks whose value lies in the range. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const query = readQuery(request, blockQuery, "The block query needs fixing.");
  try {
    const hits = await runBlockSearch(me, query);
    return resultsJson({
      blocks: hits.map((h) => ({
        sheet: sheetNumberLabel(h.sheetNumber),
        title: h.title,
        project: h.projectCode,
        revision: h.revisionLabel,
        state: h.state,
        block: h.blockId,
        calculator: h.calculator,
        values: h.values,
      })),
    });
  } catch (error) {
    if (error instanceof BlockSearchInputError || error instanceof BlockQueryError) return apiError(400, error.message);
    throw error;
  }
}

export async function action({ request, context }: Route.ActionArgs) {
  await requireMember(request, context, "viewer");
  return methodNotAllowed("GET");
}
