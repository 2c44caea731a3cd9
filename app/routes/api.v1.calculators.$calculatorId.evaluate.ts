import type { Route } from "./+types/api.v1.calculators.$calculatorId.evaluate";
import { evaluateCalculator } from "~/lib/calc/evaluate-sheet";
import { getCalculator } from "~/lib/calc/registry";
import { calculatorInputsBody } from "~/lib/forms/api";
import { requireMember } from "~/.server/access";
import { apiError, methodNotAllowed, readJson, resultsJson } from "~/.server/api";


/** POST /api/v1/calculators/:id/evaluate with { inputs } → { calculator, engineVersion, results, warnings }. */
export async function action({ request, params, context }: Route.ActionArgs) {
  await requireMember(request, context, "viewer");
  if (request.method !== "POST") return methodNotAllowed("POST");
  if (!getCalculator(params.calculatorId)) return apiError(404, `No calculator "${params.calculatorId}". GET /api/v1/calculators lists them.`);
  const { inputs } = await readJson(request, calculatorInputsBody);
  const outcome = evaluateCalculator(params.calculatorId, inputs);
  if (!outcome.ok) return apiError(400, "Some inputs need fixing.", outcome.errors);
  return resultsJson({ calculator: outcome.calculator, engineVersion: outcome.engineVersion, results: outcome.results, warnings: outcome.warnings });
}

export async function loader({ request, context }: Route.LoaderArgs) {
  await requireMember(request, context, "viewer");
  return methodNotAllowed("POST");
}
