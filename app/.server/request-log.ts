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
  /** The route pattern that answered (e.g. `/sheets/:number`), as the framework matched it. */
  route?: string;
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

/** Called by the root middleware with the framework's matched pattern, so logs group by route rather than by raw URL. */
export function noteRoute(pattern: string): void {
  const context = storage.getStore();
  if (context) context.route = pattern.startsWith("/") ? pattern : `/${pattern}`;
}

/** Called by the access check once it knows who is asking. */
export function noteSignedIn(userId: string, via: RequestLogContext["via"]): void {
  const context = storage.getStore();
  if (context) {
    context.userId = userId;
    context.via = via;
  }
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
