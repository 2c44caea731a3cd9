import { redirect } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/teams.switch";
import { membershipsOf, requireUser } from "~/.server/access";
import { auth } from "~/.server/auth";

const switchForm = z.object({ teamId: z.string().min(1) });

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const parsed = switchForm.safeParse(Object.fromEntries(await request.formData()));
  const teams = await membershipsOf(user.id);
  if (!parsed.success || !teams.some((t) => t.teamId === parsed.data.teamId)) {
    throw new Response("You are not a member of that team.", { status: 403 });
  }
  await auth().api.setActiveOrganization({ headers: request.headers, body: { organizationId: parsed.data.teamId } });
  throw redirect("/sheets");
}

export function loader() {
  throw redirect("/sheets");
}
