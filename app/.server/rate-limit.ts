import { lt, sql } from "drizzle-orm";
import { identityOf } from "./access";
import type { RouterContextProvider } from "react-router";
import { config } from "./config";
import { clientAddressContext } from "./context";
import { db } from "./db/client";
import { apiRateLimit } from "./db/schema";

export interface RateLimitDecision {
  allowed: boolean;
  limit: number;
  remaining: number;
  /** Whole seconds until the window resets. */
  retryAfter: number;
}

/**
 * Counts one request for `key` and says whether it may proceed. A fixed window that
 * starts at a key's first request: one atomic upsert against PostgreSQL, so every app
 * server shares the count and two requests never read the same value; the database
 * clock decides when the window ends.
 */
export async function consumeRateLimit(key: string, limit: number, windowSeconds: number): Promise<RateLimitDecision> {
  const window = sql`make_interval(secs => ${windowSeconds})`;
  const current = sql`${apiRateLimit.windowStart} > clock_timestamp() - ${window}`;
  const rows = await db().execute<{ count: number; retry_after: number }>(sql`
    insert into ${apiRateLimit} (key, window_start, count) values (${key}, clock_timestamp(), 1)
    on conflict (key) do update set
      count = case when ${current} then ${apiRateLimit.count} + 1 else 1 end,
      window_start = case when ${current} then ${apiRateLimit.windowStart} else clock_timestamp() end
    returning count, greatest(1, ceil(extract(epoch from (window_start + ${window} - clock_timestamp()))))::int as retry_after`);
  const { count, retry_after: retryAfter } = rows.rows[0]!;
  return { allowed: count <= limit, limit, remaining: Math.max(0, limit - count), retryAfter };
}

/** Counters whose window ended long ago; one server in a hundred requests sweeps them, so the table stays small. */
async function sweepExpired(windowSeconds: number): Promise<void> {
  await db()
    .delete(apiRateLimit)
    .where(lt(apiRateLimit.windowStart, sql`clock_timestamp() - make_interval(secs => ${windowSeconds * 2})`));
}

/** A live API key is counted as itself; anything else (session, anonymous, a wrong key) as the client's address. */
async function rateLimitKey(context: Readonly<RouterContextProvider>): Promise<string> {
  const keyId = (await identityOf(context))?.apiKeyId;
  return keyId ? `api-key:${keyId}` : `client:${context.get(clientAddressContext) || "unknown"}`;
}

/**
 * The API's rate limit, for every /api/v1/* request: throws a 429 JSON response with
 * Retry-After once a key or client has used up the window. Off with RATE_LIMITS=off.
 */
export async function enforceApiRateLimit(request: Request, context: Readonly<RouterContextProvider>): Promise<void> {
  const cfg = config();
  if (cfg.RATE_LIMITS === "off" || !new URL(request.url).pathname.startsWith("/api/v1/")) return;
  const decision = await consumeRateLimit(await rateLimitKey(context), cfg.API_RATE_LIMIT, cfg.API_RATE_WINDOW_SECONDS);
  if (Math.random() < 0.01) await sweepExpired(cfg.API_RATE_WINDOW_SECONDS);
  if (decision.allowed) return;
  throw Response.json(
    {
      error: `Too many API requests: the limit is ${decision.limit} per ${cfg.API_RATE_WINDOW_SECONDS} s for each API key (or client without one). Try again in ${decision.retryAfter} s.`,
    },
    { status: 429, headers: { "Retry-After": String(decision.retryAfter), "RateLimit-Limit": String(decision.limit), "RateLimit-Remaining": "0" } },
  );
}
