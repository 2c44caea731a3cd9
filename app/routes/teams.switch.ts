import { redirect } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/teams.switch";
import { identityOf } from "~/.server/access";
import { auth } from "~/.server/auth";

const switchForm = z.object({ teamId: z.string().min(1) });

export async function action({ request, context }: Route.ActionArgs) {
  const identity = await identityOf(context);
  if (!identity) throw redirect("/sign-in");
  const parsed = switchForm.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success || !identity.teams.some((t) => t.teamId === parsed.data.teamId)) {
    throw new Response("You are not a member of that team.", { status: 403 });
  }
  await auth().api.setActiveOrganization({ headers: request.headers, body: { organizationId: parsed.data.teamId } });
  throw redirect("/sheets");
}

export function loader() {
  throw redirect("/sheets");
}
