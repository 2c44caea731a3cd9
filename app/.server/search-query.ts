import type { z } from "zod";
import type { blockQuery, searchQuery } from "~/lib/forms/search";
import { getCalculator } from "~/lib/calc/registry";
import type { Dimension } from "~/lib/calc/types";
import { SI_UNIT } from "~/lib/calc/format";
import { parseQuantity } from "~/lib/calc/units";
import type { Member } from "./access";
import { documentNumberLabel, sheetNumberLabel } from "~/lib/sheets/numbering";
import { findBlocks, search, type SearchFilters, type SearchHit } from "./search";

/**
 * A hit as pages and the JSON API show it: the sheet's (or document's) label and a link
 * to the revision (or version) found.
 */
export function hitView(hit: SearchHit) {
  const isDocument = hit.kind === "document";
  const label = isDocument ? documentNumberLabel(hit.sheetNumber) : hit.sheetNumber ? sheetNumberLabel(hit.sheetNumber) : null;
  const at = hit.revisionLabel ? `/${isDocument ? "versions" : "revisions"}/${hit.revisionLabel}` : "";
  return {
    kind: hit.kind,
    sheet: isDocument ? null : label,
    document: isDocument ? label : null,
    title: hit.title,
    project: hit.projectCode,
    state: hit.state,
    revision: hit.revisionLabel,
    snippet: hit.snippet,
    url: label ? `/${isDocument ? "documents" : "sheets"}/${label}${at}` : null,
  };
}

export function searchFilters(query: z.infer<typeof searchQuery>): SearchFilters {
  return {
    verifiedOnly: Boolean(query.verified),
    projectId: query.project || undefined,
    calculator: query.calculator || undefined,
    authorId: query.author || undefined,
    updatedFrom: query.from ? new Date(`${query.from}T00:00:00Z`) : undefined,
    limit: 20,
    offset: (query.page - 1) * 20,
  };
}

export async function runSearch(me: Member, query: z.infer<typeof searchQuery>) {
  if (!query.q) return null;
  return search(me.team.teamId, query.q, searchFilters(query));
}

export class BlockSearchInputError extends Error {}

/** Reads "1 kHz" / "3000" bounds in the field's own dimension, then asks findBlocks. */
export async function runBlockSearch(me: Member, query: z.infer<typeof blockQuery>) {
  const calculator = getCalculator(query.calculator);
  if (!calculator) throw new BlockSearchInputError(`No calculator "${query.calculator}".`);
  const spec = calculator.inputs.find((i) => i.key === query.field);
  const output = calculator.outputs.find((o) => o.key === query.field);
  // Bounds are typed like any quantity ("1 kHz"); inputs use their own spec, results the dimension of their SI unit.
  const dimension =
    spec?.kind === "quantity" ? spec.dimension : (Object.entries(SI_UNIT).find(([, unit]) => unit === output?.unit)?.[0] as Dimension | undefined) ?? "dimensionless";
  const displayUnit = spec?.kind === "quantity" ? spec.displayUnit : (output?.unit ?? "");
  const bound = (text: string, which: string): number | undefined => {
    if (!text) return undefined;
    const parsed = parseQuantity(text, { key: which, dimension, displayUnit });
    if (!parsed.ok) throw new BlockSearchInputError(parsed.message);
    return parsed.value;
  };
  return findBlocks(me.team.teamId, {
    calculator: calculator.id,
    ranges: [{ field: query.field, of: query.of, min: bound(query.min, "min"), max: bound(query.max, "max") }],
    verifiedOnly: Boolean(query.verified),
  });
}

