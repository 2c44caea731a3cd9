import type { Route } from "./+types/api.auth.$";
import { handleAuthRequest } from "~/.server/auth";

// better-auth's own endpoints (sessions, sign-in, organization API) under /api/auth/*.
export function loader({ request }: Route.LoaderArgs) {
  return handleAuthRequest(request);
}

export function action({ request }: Route.ActionArgs) {
  return handleAuthRequest(request);
}
