import { AsyncLocalStorage } from "node:async_hooks";
import { matchRoutes, type RouteObject } from "react-router";

/**
 * What server.js's request log line says beyond method, URL and status: who asked
 * and which route answered. The context lives only as long as its request (an
 * AsyncLocalStorage store), so servers stay stateless.
 */
export interface RequestLogContext {
  userId?: string;
  via?: "session" | "api-key";
}

const storage = new AsyncLocalStorage<RequestLogContext>();

/** Runs one request's handling with a fresh log context that `noteSignedIn` fills in. */
export function runWithRequestLog<T>(context: RequestLogContext, handle: () => T): T {
  return storage.run(context, handle);
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
 * data requests (`/sheets/CS-0001.data`) count as their page.
 */
export function createRouteMatcher(manifest: Record<string, BuildRoute | undefined>): (pathname: string) => string {
  const children = new Map<string | undefined, BuildRoute[]>();
  for (const route of Object.values(manifest)) {
    if (!route) continue;
    const siblings = children.get(route.parentId) ?? [];
    siblings.push(route);
    children.set(route.parentId, siblings);
  }
  const tree = (parentId: string | undefined): RouteObject[] =>
    (children.get(parentId) ?? []).map((route) =>
      route.index ? { id: route.id, index: true, path: route.path } : { id: route.id, path: route.path, children: tree(route.id) },
    );
  const routes = tree(undefined);
  return (pathname) => {
    const page = pathname === "/_root.data" ? "/" : pathname.replace(/\.data$/, "");
    const matches = matchRoutes(routes, page);
    if (!matches) return "unmatched";
    const segments = matches.map((m) => m.route.path).filter((p): p is string => Boolean(p));
    return `/${segments.join("/")}`.replace(/\/+/g, "/");
  };
}

const SECRET_QUERY = /token|password|secret|key|code|signature|session/i;

/**
 * The URL as a log may show it: query values that could be credentials (reset
 * tokens, keys) and the token in better-auth's reset-password path are replaced.
 */
export function redactUrl(rawUrl: string): string {
  const url = new URL(rawUrl, "http://log.invalid");
  const pathname = url.pathname.replace(/(\/reset-password\/)[^/]+/, "$1[redacted]");
  for (const name of [...url.searchParams.keys()]) if (SECRET_QUERY.test(name)) url.searchParams.set(name, "[redacted]");
  const search = url.searchParams.toString();
  return search ? `${pathname}?${search.replaceAll("%5Bredacted%5D", "[redacted]")}` : pathname;
}
