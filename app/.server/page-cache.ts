/**
 * Rendered-page cache for the pages people read far more often than anything on them
 * changes (a sheet revision, a project document). A page is kept, per server, under
 * everything it depends on: who reads it (user, name, team, role, their teams) and the
 * team's content version, which database triggers move whenever any row a page shows
 * is written (migration 0017). The version is read before the page is rendered, so a
 * cached page is never older than its key says; any write makes the next view render
 * afresh, on every server, with nothing to invalidate by hand.
 *
 * Only the body is kept. Each answer gets its own nonce (swapped into the cached
 * HTML), its own headers and request id. Served pages say `X-Page-Cache: hit|miss`.
 */
import { randomBytes } from "node:crypto";
import { eq } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import type { MiddlewareFunction } from "react-router";
import { getSignedIn, membershipsOf } from "./access";
import { config } from "./config";
import { db } from "./db/client";
import { teamContentVersion } from "./db/schema";
import { currentRequestLog } from "./request-log";
import { applySecurityHeaders, isSecureRequest } from "./security-headers";

/**
 * Tables whose rows no cached page shows, so writing them moves no version. Every other
 * table has the `<table>_content_changed` trigger; a test holds the database to this list.
 */
export const TABLES_PAGES_DO_NOT_SHOW: Record<string, string> = {
  session: "sign-in sessions: who is asking is part of the key, not of the page",
  account: "password hashes and sign-in methods",
  verification: "password-reset and e-mail tokens",
  rate_limit: "sign-in rate-limit counters",
  api_rate_limit: "API rate-limit counters",
  outbox: "mail waiting to be sent",
  search_document: "the search index, derived from the tables that are watched",
  team_content_version: "the versions themselves",
  __drizzle_migrations: "the migration ledger",
};

interface CachedPage {
  /** The HTML split at its nonce, so each answer can carry a fresh one. */
  parts: Buffer[];
  status: number;
  contentType: string;
}

let pages: LRUCache<string, CachedPage> | undefined;
function store(): LRUCache<string, CachedPage> | undefined {
  const megabytes = config().PAGE_CACHE_MB;
  if (megabytes === 0) return undefined;
  pages ??= new LRUCache<string, CachedPage>({
    maxSize: megabytes * 1024 * 1024,
    sizeCalculation: (page) => page.parts.reduce((sum, part) => sum + part.length, 0) || 1,
  });
  return pages;
}

async function teamVersion(teamId: string): Promise<number> {
  const [row] = await db().select({ version: teamContentVersion.version }).from(teamContentVersion).where(eq(teamContentVersion.teamId, teamId));
  return row?.version ?? 0;
}

/** The nonce entry.server put in the page's policy: every `nonce="…"` in the HTML is this one. */
function nonceOf(response: Response): string | undefined {
  return /'nonce-([A-Za-z0-9+/=]+)'/.exec(response.headers.get("content-security-policy") ?? "")?.[1];
}

function splitAtNonce(html: Buffer, nonce: string): Buffer[] {
  const marker = Buffer.from(`nonce="${nonce}"`);
  const parts: Buffer[] = [];
  let from = 0;
  for (let at = html.indexOf(marker, from); at !== -1; at = html.indexOf(marker, from)) {
    parts.push(html.subarray(from, at));
    from = at + marker.length;
  }
  parts.push(html.subarray(from));
  return parts;
}

function answer(request: Request, page: CachedPage): Response {
  const nonce = randomBytes(16).toString("base64");
  const marker = Buffer.from(`nonce="${nonce}"`);
  const body = Buffer.concat(page.parts.flatMap((part, i) => (i === 0 ? [part] : [marker, part])));
  const headers = new Headers({ "Content-Type": page.contentType, "X-Page-Cache": "hit" });
  applySecurityHeaders(headers, { nonce, html: true, secure: isSecureRequest(request) });
  return new Response(body, { status: page.status, headers });
}

/**
 * Route middleware for a page worth caching. Anything unusual (not a plain GET of the
 * page, nobody signed in, an API key, no team) goes straight to the loaders, which
 * answer it as they always do.
 */
export const pageCache: MiddlewareFunction<Response> = async ({ request }, next) => {
  const pages = store();
  const url = new URL(request.url);
  if (!pages || request.method !== "GET" || url.pathname.endsWith(".data")) return next();
  const signedIn = await getSignedIn(request);
  if (!signedIn || signedIn.via !== "session") return next();
  const teams = await membershipsOf(signedIn.user.id);
  const team = teams.find((t) => t.teamId === signedIn.activeTeamId) ?? teams[0];
  if (!team) return next();
  // Read before rendering: a change committed meanwhile moves the version past this key.
  const version = await teamVersion(team.teamId);
  const key = JSON.stringify([version, team.teamId, team.role, signedIn.user.id, signedIn.user.name, teams.map((t) => [t.teamId, t.teamName, t.role]), url.pathname + url.search]);
  const cached = pages.get(key);
  if (cached) return answer(request, cached);

  const response = await next();
  response.headers.set("X-Page-Cache", "miss");
  const nonce = nonceOf(response);
  const contentType = response.headers.get("content-type") ?? "";
  if (response.status !== 200 || !response.body || !nonce || !contentType.startsWith("text/html") || response.headers.has("set-cookie")) return response;
  // One branch to the reader as it streams, one collected for the cache.
  const [toReader, toCache] = response.body.tee();
  const log = currentRequestLog();
  void new Response(toCache)
    .arrayBuffer()
    .then((html) => {
      // A page whose rendering failed part-way is sent as it is, never kept.
      if (log?.renderFailed) return;
      pages.set(key, { parts: splitAtNonce(Buffer.from(html), nonce), status: 200, contentType });
    })
    .catch(() => {});
  return new Response(toReader, { status: response.status, statusText: response.statusText, headers: response.headers });
};
