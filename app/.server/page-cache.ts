/**
 * Rendered-page cache for the pages people read far more often than anything on them
 * changes (a sheet revision, a project document). A page is kept, per server, under
 * everything it depends on: who reads it (user, name, team, role, their teams) and the
 * team's content version, which database triggers move whenever any row a page shows
 * is written (migrations 0017 and 0019). The version is read before the page is rendered, so a
 * cached page is never older than its key says; any write makes the next view render
 * afresh, on every server, with nothing to invalidate by hand.
 *
 * A kept page is sent byte for byte as it was rendered, so it is compressed once, when
 * kept. Its inline scripts are allowed by their SHA-256 in the policy rather than by the
 * first answer's nonce (a nonce must not be reused; a hash of the page's own scripts
 * allows exactly those). Served pages say `X-Page-Cache: hit|miss`.
 */
import { createHash } from "node:crypto";
import { promisify } from "node:util";
import { brotliCompress, constants as zlibConstants, gunzipSync, gzip } from "node:zlib";
import { sql } from "drizzle-orm";
import { LRUCache } from "lru-cache";
import type { MiddlewareFunction } from "react-router";
import { signedSessionToken } from "./access";
import { SESSION_REFRESH_SECONDS, SESSION_SECONDS } from "./auth";
import { config } from "./config";
import { db } from "./db/client";
import { currentRequestLog, noteSignedIn } from "./request-log";
import { isRole } from "./roles";
import { isSecureRequest, securityHeaders } from "./security-headers";

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
  api_key: "personal API keys, shown only on the Settings page (its last use is written once a minute)",
  sheet_draft: "autosaved editor drafts, shown only in the editor (written every few seconds while someone types)",
  document_draft: "autosaved editor drafts, shown only in the editor",
  search_document: "the search index, derived from the tables that are watched",
  team_content_version: "the versions themselves",
  __drizzle_migrations: "the migration ledger",
};

interface CachedPage {
  /**
   * The page compressed once, for the encodings browsers ask for. The plain bytes are not kept
   * (a sheet page is several times its compressed size): the rare client that takes neither gets
   * them unzipped again.
   */
  gzip: Buffer;
  br: Buffer;
  /** SHA-256 sources of the page's inline scripts, for its Content-Security-Policy. */
  scriptHashes: string[];
  contentType: string;
}

export type PageEncoding = "br" | "gzip" | "identity";

let pages: LRUCache<string, CachedPage> | undefined;
function store(): LRUCache<string, CachedPage> | undefined {
  const megabytes = config().PAGE_CACHE_MB;
  if (megabytes === 0) return undefined;
  pages ??= new LRUCache<string, CachedPage>({
    maxSize: megabytes * 1024 * 1024,
    sizeCalculation: (page) => page.gzip.length + page.br.length,
  });
  return pages;
}

const gzipAsync = promisify(gzip);
const brotliAsync = promisify(brotliCompress);

/** `'sha256-…'` of each inline script, exactly as the browser hashes its text. */
export function inlineScriptHashes(html: string): string[] {
  const hashes = new Set<string>();
  for (const match of html.matchAll(/<script(?![^>]*\ssrc=)[^>]*>([\s\S]*?)<\/script>/gi)) {
    hashes.add(`'sha256-${createHash("sha256").update(match[1]!, "utf8").digest("base64")}'`);
  }
  return [...hashes];
}

async function keep(html: Buffer, contentType: string): Promise<CachedPage> {
  const [gzipped, brotli] = await Promise.all([
    gzipAsync(html),
    // Quality 5: most of brotli's gain at a few milliseconds, once per kept page.
    brotliAsync(html, { params: { [zlibConstants.BROTLI_PARAM_QUALITY]: 5, [zlibConstants.BROTLI_PARAM_SIZE_HINT]: html.length } }),
  ]);
  return { gzip: gzipped, br: brotli, scriptHashes: inlineScriptHashes(html.toString("utf8")), contentType };
}

function pageHeaders(page: CachedPage, secure: boolean): Record<string, string> {
  return { ...securityHeaders({ scriptSources: page.scriptHashes, html: true, secure }), "Content-Type": page.contentType, Vary: "Accept-Encoding", "X-Page-Cache": "hit" };
}

interface Reader {
  userId: string;
  userName: string;
  activeTeamId: string | null;
  /** Every team of the reader with its content version, by name. */
  teams: { teamId: string; teamName: string; role: string; version: number }[];
}

/**
 * The reader a session token belongs to, with their teams, in one query: the whole cost of a
 * hit. A session past its expiry, or due for better-auth's daily extension, gives null, so the
 * framework's own session check answers (and extends it).
 */
async function readerOfSession(token: string): Promise<Reader | null> {
  const rows = await db().execute<{ user_id: string; user_name: string; active_team_id: string | null; team_id: string | null; team_name: string | null; role: string | null; version: number | null }>(sql`
    select u.id as user_id, u.name as user_name, s.active_organization_id as active_team_id,
      o.id as team_id, o.name as team_name, m.role, coalesce(v.version, 0)::int as version
    from session s
    join "user" u on u.id = s.user_id
    left join member m on m.user_id = u.id
    left join organization o on o.id = m.organization_id
    left join team_content_version v on v.team_id = o.id
    where s.token = ${token} and s.expires_at > now() + make_interval(secs => ${SESSION_SECONDS - SESSION_REFRESH_SECONDS})
    order by o.name`);
  const first = rows.rows[0];
  if (!first) return null;
  const teams = rows.rows.filter((r) => r.team_id && r.team_name && r.role).map((r) => ({ teamId: r.team_id!, teamName: r.team_name!, role: r.role!, version: Number(r.version) }));
  return { userId: first.user_id, userName: first.user_name, activeTeamId: first.active_team_id, teams };
}

/**
 * Everything a cached page depends on besides its rows: who reads it (their name shows in the
 * header, their role and authorship decide the actions, their teams fill the team switcher)
 * and the team's content version. Null when the framework should answer (no team: the
 * loaders redirect).
 */
function pageKey(reader: Reader, pathWithSearch: string): string | null {
  const teams = reader.teams.filter((t) => isRole(t.role));
  // The team requireMember picks for a session.
  const team = teams.find((t) => t.teamId === reader.activeTeamId) ?? teams[0];
  if (!team) return null;
  return JSON.stringify([team.version, team.teamId, reader.userId, reader.userName, teams.map((t) => [t.teamId, t.teamName, t.role]), pathWithSearch]);
}

/** The cache key for this reader and URL, from the session cookie alone; null when the framework must answer. */
async function keyOf(cookie: string | null, url: string): Promise<string | null> {
  const token = cookie ? await signedSessionToken(cookie) : null;
  const reader = token ? await readerOfSession(token) : null;
  if (!reader) return null;
  noteSignedIn(reader.userId, "session");
  return pageKey(reader, pathWithSearch(url));
}

function pathWithSearch(url: string): string {
  const parsed = new URL(url, "http://page");
  return parsed.pathname + parsed.search;
}

/**
 * Route middleware for a page worth caching: answers from the cache when it can, else lets
 * the loaders render and keeps the page. It finds the reader as server.js does (`keyOf`).
 * Anything unusual (not a plain GET of the page, nobody signed in, an API key, no team, a
 * session due for its extension) goes straight to the loaders, which answer it as they
 * always do.
 */
export const pageCache: MiddlewareFunction<Response> = async ({ request }, next) => {
  const pages = store();
  if (!pages || request.method !== "GET" || new URL(request.url).pathname.endsWith(".data")) return next();
  // Read before rendering: a change committed meanwhile moves the version past this key.
  const key = await keyOf(request.headers.get("cookie"), request.url);
  if (!key) return next();
  const cached = pages.get(key);
  if (cached) {
    // Uncompressed here: server.js answers hits itself, with the kept compressed bytes.
    return new Response(new Uint8Array(gunzipSync(cached.gzip)), { status: 200, headers: pageHeaders(cached, isSecureRequest(request)) });
  }

  const response = await next();
  response.headers.set("X-Page-Cache", "miss");
  const contentType = response.headers.get("content-type") ?? "";
  if (response.status !== 200 || !response.body || !contentType.startsWith("text/html") || response.headers.has("set-cookie")) return response;
  // One branch to the reader as it streams, one collected for the cache.
  const [toReader, toCache] = response.body.tee();
  const log = currentRequestLog();
  void new Response(toCache)
    .arrayBuffer()
    .then(async (html) => {
      // A page whose rendering failed part-way is sent as it is, never kept.
      if (log?.renderFailed) return;
      pages.set(key, await keep(Buffer.from(html), contentType));
    })
    .catch(() => {});
  return new Response(toReader, { status: response.status, statusText: response.statusText, headers: response.headers });
};

/**
 * server.js's way in: a cached page for a plain GET with a session cookie, looked up before
 * React Router builds a request, or null to let the framework answer (and keep the page
 * through `pageCache`).
 */
export async function cachedPageAnswer(request: { url: string; cookie: string; secure: boolean; encoding: PageEncoding }): Promise<{ headers: Record<string, string>; body: Buffer } | null> {
  const pages = store();
  if (!pages) return null;
  const key = await keyOf(request.cookie, request.url);
  const cached = key ? pages.get(key) : undefined;
  if (!cached) return null;
  const body = request.encoding === "identity" ? gunzipSync(cached.gzip) : cached[request.encoding];
  return { body, headers: { ...pageHeaders(cached, request.secure), ...(request.encoding === "identity" ? {} : { "Content-Encoding": request.encoding }) } };
}

interface ManifestRoute {
  id: string;
  parentId?: string;
  path?: string;
  module: { middleware?: unknown[] };
}

/** The URL patterns (e.g. `/sheets/:number`) of the routes that use `pageCache`, from the server build's manifest. */
export function cachedPagePatterns(manifest: Record<string, ManifestRoute | undefined>): string[] {
  const fullPath = (route: ManifestRoute | undefined): string => (route ? `${fullPath(route.parentId ? manifest[route.parentId] : undefined)}/${route.path ?? ""}` : "");
  return Object.values(manifest)
    .filter((route): route is ManifestRoute => Boolean(route?.module.middleware?.includes(pageCache)))
    .map((route) => fullPath(route).replace(/\/+/g, "/").replace(/(.)\/$/, "$1"));
}
