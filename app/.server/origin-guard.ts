import { trustedOrigins } from "./config";

/**
 * Refuses cross-site form posts: a state-changing request from a browser must come
 * from one of our origins. Requests with no Origin (API clients with a Bearer key,
 * curl) are not browser form posts and pass; cookies are SameSite=Lax as well.
 */
export function originGuard(request: Request): void {
  if (["GET", "HEAD", "OPTIONS"].includes(request.method)) return;
  const origin = request.headers.get("origin");
  if (!origin || origin === "null") {
    if (origin === "null") throw new Response("Cross-site request refused.", { status: 403 });
    return;
  }
  const allowed = trustedOrigins();
  const own = new URL(request.url).origin;
  if (origin !== own && !allowed.includes(origin)) {
    throw new Response("Cross-site request refused: this form must be sent from Sinewright itself.", { status: 403 });
  }
}
