import { z } from "zod";
import type { Route } from "./+types/api.v1.evaluate";
import { evaluateSheet } from "~/lib/calc/evaluate-sheet";
import { requireMember } from "~/.server/access";
import { apiError, methodNotAllowed, readJson } from "~/.server/api";

const MAX_BLOCKS = 200;
const body = z.object({
  blocks: z
    .array(z.unknown(), { message: "`blocks` must be a list of {id, calculator, inputs}." })
    .max(MAX_BLOCKS, `A sheet holds at most ${MAX_BLOCKS} blocks.`),
});

/** POST /api/v1/evaluate with { blocks } → each block's results or field errors, in dependency order. */
export async function action({ request, context }: Route.ActionArgs) {
  await requireMember(request, context, "viewer");
  if (request.method !== "POST") return methodNotAllowed("POST");
  const { blocks } = await readJson(request, body);
  const evaluation = evaluateSheet(blocks);
  if (evaluation.errors.length > 0) return apiError(400, "The sheet itself needs fixing.", evaluation.errors);
  return Response.json(evaluation);
}

export async function loader({ request, context }: Route.LoaderArgs) {
  await requireMember(request, context, "viewer");
  return methodNotAllowed("POST");
}
