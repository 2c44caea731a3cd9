import { AsyncLocalStorage } from "node:async_hooks";

/**
 * What server.js's request log line says beyond method, URL and status: who asked
 * and which route answered. The context lives only as long as its request (an
 * AsyncLocalStorage store), so servers stay stateless.
 */
export interface RequestLogContext {
  /** The id server.js gave the request (also its X-Request-Id header), so error lines point at their request line. */
  requestId?: string;
  userId?: string;
  via?: "session" | "api-key";
  /** Rendering failed after the page started streaming: such a page is never cached. */
  renderFailed?: boolean;
}

const storage = new AsyncLocalStorage<RequestLogContext>();

/** Runs one request's handling with a fresh log context that `noteSignedIn` fills in. */
export function runWithRequestLog<T>(context: RequestLogContext, handle: () => T): T {
  return storage.run(context, handle);
}

/** The log context of the request being answered, if any. */
export function currentRequestLog(): RequestLogContext | undefined {
  return storage.getStore();
}

/** Called by the access check once it knows who is asking. */
export function noteSignedIn(userId: string, via: RequestLogContext["via"]): void {
  const context = storage.getStore();
  if (context) {
    context.userId = userId;
    context.via = via;
  }
}

interface BuildRoute {
  id: string;
  parentId?: string;
  path?: string;
  index?: boolean;
}

/**
 * The route pattern a URL matched (e.g. `/sheets/:number`), from the server
 * build's route manifest, so logs group by route rather than by raw URL. Single-fetch
 * data requests (`/sheets/CS-0001.data`) count as their page. The manifest is
 * flattened and ranked once, as React Router ranks it; a request then costs one
 * `matchRoutes` over the prepared branches.
 */
export function createRouteMatcher(manifest: Record<string, BuildRoute | undefined>): (pathname: string) => string {
  const children = new Map<string | undefined, BuildRoute[]>();
  for (const route of Object.values(manifest)) {
    if (!route) continue;
    const siblings = children.get(route.parentId) ?? [];
    siblings.push(route);
    children.set(route.parentId, siblings);
  }
  // Leaf routes only, each with its full path: what a URL can end on.
  const patterns: string[] = [];
  const walk = (parentId: string | undefined, prefix: string) => {
    for (const route of children.get(parentId) ?? []) {
      const full = route.path ? `${prefix}/${route.path}` : prefix;
      const kids = children.get(route.id);
      if (kids?.length) walk(route.id, full);
      if (route.index || route.path || !kids?.length) patterns.push(full.replace(/\/+/g, "/") || "/");
    }
  };
  walk(undefined, "");
  const compiled = [...new Set(patterns)].map((pattern) => ({ pattern, score: patternScore(pattern), regex: patternRegex(pattern) }));
  compiled.sort((a, b) => b.score - a.score);
  return (pathname) => {
    const page = pathname === "/_root.data" ? "/" : pathname.replace(/\.data$/, "");
    return compiled.find((c) => c.regex.test(page))?.pattern ?? "unmatched";
  };
}

/** React Router's ranking: static segments beat dynamic ones, a splat comes last. */
function patternScore(pattern: string): number {
  const segments = pattern.split("/").filter(Boolean);
  let score = segments.length + (segments.includes("*") ? -2 : 0);
  for (const segment of segments) score += segment === "*" ? 0 : segment.startsWith(":") ? 3 : 10;
  return score;
}

function patternRegex(pattern: string): RegExp {
  const segments = pattern.split("/").filter(Boolean);
  const body = segments
    .map((segment) => (segment === "*" ? "(?:/.*)?" : segment.startsWith(":") ? "/[^/]+" : `/${segment.replace(/[.+?^${}()|[\]\\]/g, "\\$&")}`))
    .join("");
  return new RegExp(`^${body}/?$`, "i");
}

const SECRET_QUERY = /token|password|secret|key|code|signature|session|invitation/i;
/** An invitation's id is its link's only secret: whoever has it can open the invitation. */
const INVITATION_PATH = /(\/invitations\/)[^/?#]+/g;

/**
 * The URL as a log may show it: query values that could be credentials (reset
 * tokens, keys, invitation ids), the token in better-auth's reset-password path and
 * the id in an invitation's path — also where a path is a query value (`?next=…`) —
 * are replaced.
 */
export function redactUrl(rawUrl: string): string {
  const url = new URL(rawUrl, "http://log.invalid");
  const pathname = url.pathname.replace(/(\/reset-password\/)[^/]+/, "$1[redacted]").replace(INVITATION_PATH, "$1[redacted]");
  const invitationEndpoint = /\/organization\/[a-z-]*invitation/i.test(pathname);
  for (const [name, value] of [...url.searchParams]) {
    if (SECRET_QUERY.test(name) || (invitationEndpoint && name === "id")) url.searchParams.set(name, "[redacted]");
    else if (value.includes("/invitations/")) url.searchParams.set(name, value.replace(INVITATION_PATH, "$1[redacted]"));
  }
  const search = url.searchParams.toString();
  return search ? `${pathname}?${search.replaceAll("%5Bredacted%5D", "[redacted]")}` : pathname;
}
