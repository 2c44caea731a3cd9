import type { Route } from "./+types/api.v1.sheets.$number.revisions.$rev";
import { parseSheetNumber } from "~/lib/sheets/numbering";
import { requireMember } from "~/.server/access";
import { apiError, methodNotAllowed, resultsJson } from "~/.server/api";
import { checkIntegrity, revisionReview } from "~/.server/review";
import { getRevision, getSheet, revisionBlocks } from "~/.server/sheets";

/** GET /api/v1/sheets/:number/revisions/:rev — one revision's inputs, results, state, hash and stamp, for scripts and citations. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const me = await requireMember(request, context, "viewer");
  const number = parseSheetNumber(params.number);
  const sheet = number ? await getSheet(me.team.teamId, number) : undefined;
  if (!sheet) return apiError(404, `No sheet ${params.number} in this team.`);
  const revision = await getRevision(sheet.id, params.rev);
  if (!revision) return apiError(404, `Sheet ${sheet.label} has no revision ${params.rev.toUpperCase()}.`);
  const [rows, review] = await Promise.all([revisionBlocks([revision.id]), revisionReview(revision.id)]);
  const integrity = await checkIntegrity(revision, rows, review.stamp?.contentHash ?? null);
  return resultsJson({
    sheet: sheet.label,
    title: sheet.title,
    project: sheet.projectCode,
    revision: revision.label,
    state: revision.state,
    latest: revision.id === sheet.latestRevisionId,
    author: revision.authorName,
    createdAt: revision.createdAt.toISOString(),
    engineVersion: revision.engineVersion,
    contentHash: revision.contentHash,
    integrity: { hashMatches: integrity.hashMatches, stampValid: integrity.stampValid, drift: integrity.drift },
    stamp: review.stamp ? { checker: review.stamp.checkerName, at: review.stamp.createdAt.toISOString(), contentHash: review.stamp.contentHash, engineVersion: review.stamp.engineVersion } : null,
    url: new URL(`/sheets/${sheet.label}/revisions/${revision.label}`, request.url).pathname,
    blocks: rows.map((r) => ({ id: r.blockId, calculator: r.calculator, inputs: r.inputs, ok: r.ok, results: r.results, errors: r.errors, warnings: r.warnings })),
    // Measured-waveform blocks: the capture (id, name, SHA-256), its analysis summary and the comparison, as hashed.
    measurements: revision.measurements ?? {},
  });
}

export async function action({ request, context }: Route.ActionArgs) {
  await requireMember(request, context, "viewer");
  return methodNotAllowed("GET");
}
