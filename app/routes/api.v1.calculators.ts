import type { Route } from "./+types/api.v1.calculators";
import { catalogue } from "~/lib/calc/registry";
import { requireMember } from "~/.server/access";
import { methodNotAllowed } from "~/.server/api";

/** GET /api/v1/calculators — every calculator with its inputs (units, ranges, defaults) and outputs. */
export async function loader({ request, context }: Route.LoaderArgs) {
  await requireMember(request, context, "viewer");
  return Response.json(catalogue());
}

export async function action({ request, context }: Route.ActionArgs) {
  await requireMember(request, context, "viewer");
  return methodNotAllowed("GET");
}
