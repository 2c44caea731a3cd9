import { redirect } from "react-router";
import type { Route } from "./+types/sign-out";
import { auth } from "~/.server/auth";
import { cookiesFrom } from "~/.server/auth-response";

// POST only: a link or prefetch must never sign anyone out.
export async function loader() {
  throw redirect("/");
}

export async function action({ request }: Route.ActionArgs) {
  const response = await auth().api.signOut({ headers: request.headers, asResponse: true });
  throw redirect("/sign-in", { headers: cookiesFrom(response) });
}
