import type { Route } from "./+types/api.v1.evaluate";
import { evaluateSheet } from "~/lib/calc/evaluate-sheet";
import { evaluateBody } from "~/lib/forms/api";
import { requireMember } from "~/.server/access";
import { apiError, methodNotAllowed, readJson, resultsJson } from "~/.server/api";

/** POST /api/v1/evaluate with { blocks } → each block's results or field errors, in dependency order. */
export async function action({ request, context }: Route.ActionArgs) {
  await requireMember(request, context, "viewer");
  if (request.method !== "POST") return methodNotAllowed("POST");
  const { blocks } = await readJson(request, evaluateBody);
  const evaluation = evaluateSheet(blocks);
  if (evaluation.errors.length > 0) return apiError(400, "The sheet itself needs fixing.", evaluation.errors);
  return resultsJson(evaluation);
}

export async function loader({ request, context }: Route.LoaderArgs) {
  await requireMember(request, context, "viewer");
  return methodNotAllowed("POST");
}
