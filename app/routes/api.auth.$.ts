import type { Route } from "./+types/api.auth.$";
import { auth } from "~/.server/auth";

// better-auth's own endpoints (sessions, sign-in, organization API) under /api/auth/*.
export function loader({ request }: Route.LoaderArgs) {
  return auth().handler(request);
}

export function action({ request }: Route.ActionArgs) {
  return auth().handler(request);
}
