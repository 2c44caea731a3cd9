import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createApiKey, pageText, signUpWithTeam, Visitor } from "../support/http";
import type { SpawnedServer } from "../support/app-server";
import { SEEDED_SERVER_TIMEOUT_MS, startOwnServer } from "../support/own-server";
import { serverQuery } from "../support/server-db";

/** The headers every response must carry, whatever produced it. */
function expectSecurityHeaders(response: Response, what: string) {
  expect(response.headers.get("x-content-type-options"), what).toBe("nosniff");
  expect(response.headers.get("referrer-policy"), what).toBe("strict-origin-when-cross-origin");
  expect(response.headers.get("content-security-policy") ?? "", what).toContain("frame-ancestors 'none'");
}

describe("security headers on every response", () => {
  it("covers pages, JSON, redirects, 404s, static files, health and unreadable requests", async () => {
    const anonymous = new Visitor();
    const signIn = await anonymous.get("/sign-in");
    const script = (await signIn.text()).match(/"(\/assets\/[^"]+\.js)"/)?.[1];
    expect(script, "the sign-in page loads a script from /assets").toBeTruthy();
    const cases: [string, Response, number][] = [
      ["page", await anonymous.get("/sign-in"), 200],
      ["JSON 401", await anonymous.get("/api/v1/calculators"), 401],
      ["API 404", await anonymous.get("/api/v1/no-such-endpoint"), 404],
      ["redirect to sign-in", await anonymous.get("/sheets"), 302],
      ["page 404", await anonymous.get("/no-such-page"), 404],
      ["static asset", await anonymous.get(script!), 200],
      ["public file", await anonymous.get("/favicon.ico"), 200],
      ["health", await anonymous.get("/healthz"), 200],
      ["malformed URL", await anonymous.get("/sheets/%E0%A4%A"), 400],
    ];
    for (const [what, response, status] of cases) {
      expect(response.status, what).toBe(status);
      expectSecurityHeaders(response, what);
      // Served over plain HTTP with an http:// APP_URL: no HSTS (browsers ignore it there anyway).
      expect(response.headers.get("strict-transport-security"), what).toBeNull();
    }
    const malformed = cases.find(([what]) => what === "malformed URL")![1];
    expect(await malformed.text()).not.toMatch(/at \w+ \(|node_modules/);
  });

  it("adds HSTS when a trusted proxy says the request came over TLS", async () => {
    // The test server trusts loopback proxies (TRUST_PROXY's default), as a TLS-terminating proxy on the same host would be.
    const tls = { "x-forwarded-proto": "https" };
    for (const path of ["/sign-in", "/api/v1/calculators", "/favicon.ico", "/sheets"]) {
      const response = await new Visitor().get(path, tls);
      expect(response.headers.get("strict-transport-security"), path).toBe("max-age=31536000; includeSubDomains");
      expectSecurityHeaders(response, path);
    }
  });
});

describe("cross-site requests", () => {
  it("refuses a form posted from another site, on pages and resource routes, and changes nothing", async () => {
    const { visitor, email } = await signUpWithTeam("cross-site");
    const evil = { origin: "https://evil.example" };
    const page = await visitor.postForm("/settings", { intent: "create-key", name: "planted key" }, evil);
    expect([400, 403]).toContain(page.status);
    const nullOrigin = await visitor.postForm("/projects", { code: "EVIL-1", name: "Planted project" }, { origin: "null" });
    expect([400, 403]).toContain(nullOrigin.status);
    const resource = await visitor.postForm("/teams/switch", { teamId: "anything" }, evil);
    expect(resource.status).toBe(403);
    expect(await resource.text()).toContain("Cross-site request refused");
    const api = await visitor.postJson("/api/v1/evaluate", { blocks: [] }, evil);
    expect(api.status).toBe(403);
    const keys = await serverQuery(`select k.id from api_key k join "user" u on u.id = k.user_id where u.email = $1`, [email]);
    expect(keys).toEqual([]);
    const projects = await serverQuery(`select id from project where code = 'EVIL-1'`);
    expect(projects).toEqual([]);
    // The same form from our own origin works, so the refusals above were about the origin.
    const own = await visitor.postForm("/settings", { intent: "create-key", name: "own key" });
    expect(own.status).toBe(200);
  });

  it("sets session cookies SameSite=Lax and HttpOnly, so other sites' posts carry no session", async () => {
    const response = await new Visitor().postForm("/sign-in", { email: "viewer@example.com", password: "sinewright-demo", next: "" });
    expect(response.status).toBe(302);
    const session = response.headers.getSetCookie().find((c) => c.includes("session_token"));
    expect(session).toBeDefined();
    expect(session).toMatch(/SameSite=Lax/i);
    expect(session).toMatch(/HttpOnly/i);
  });
});

describe("rate limits (a server of this file's own, with limits on)", () => {
  let server: SpawnedServer;
  beforeAll(async () => {
    server = await startOwnServer({ seed: true, env: { RATE_LIMITS: "on", API_RATE_LIMIT: "5", API_RATE_WINDOW_SECONDS: "60" } });
  }, SEEDED_SERVER_TIMEOUT_MS);
  afterAll(async () => {
    await server?.stop();
  });

  it("answers the sixth API request in a minute with 429 JSON and Retry-After, per key and per client", async () => {
    const viewer = await new Visitor(server.url).signIn("viewer@example.com");
    const key = await createApiKey(viewer, "rate test");
    const statuses: number[] = [];
    for (let i = 0; i < 6; i++) statuses.push((await viewer.get("/api/v1/calculators")).status);
    expect(statuses).toEqual([200, 200, 200, 200, 200, 429]);
    const limited = await viewer.get("/api/v1/calculators");
    expect(limited.status).toBe(429);
    const retryAfter = Number(limited.headers.get("retry-after"));
    expect(retryAfter).toBeGreaterThanOrEqual(1);
    expect(retryAfter).toBeLessThanOrEqual(60);
    const body = await limited.json();
    expect(body.error).toMatch(/Too many API requests: the limit is 5 per 60 s/);
    expect(body.error).toContain(`Try again in ${retryAfter} s`);
    expectSecurityHeaders(limited, "429");
    // An API key has a budget of its own, from the same client address.
    const bearer = { authorization: `Bearer ${key}` };
    const keyed = await new Visitor(server.url).get("/api/v1/calculators", bearer);
    expect(keyed.status).toBe(200);
    for (let i = 0; i < 4; i++) await new Visitor(server.url).get("/api/v1/calculators", bearer);
    expect((await new Visitor(server.url).get("/api/v1/calculators", bearer)).status).toBe(429);
    // Pages are not counted by the API limit.
    expect((await viewer.get("/sheets")).status).toBe(200);
  });

  it("limits sign-in attempts per client on the form and the JSON endpoint alike: 429 with Retry-After", async () => {
    const visitor = new Visitor(server.url);
    const statuses: number[] = [];
    // better-auth's rule for /sign-in/email: 10 a minute per client (one more sign-in happened in the test above).
    for (let i = 0; i < 10; i++) statuses.push((await visitor.postForm("/sign-in", { email: "engineer@example.com", password: "wrong-password-here", next: "" })).status);
    expect(statuses.slice(0, 9).every((s) => s === 400)).toBe(true);
    expect(statuses.at(-1)).toBe(429);
    const page = await visitor.postForm("/sign-in", { email: "engineer@example.com", password: "sinewright-demo", next: "" });
    expect(page.status).toBe(429);
    expect(Number(page.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(await pageText(page)).toContain("Too many attempts. Wait a minute, then try again.");
    const api = await visitor.postJson("/api/auth/sign-in/email", { email: "engineer@example.com", password: "sinewright-demo" });
    expect(api.status).toBe(429);
    expect(Number(api.headers.get("retry-after"))).toBeGreaterThan(0);
  });

  it("limits password-reset requests: the sixth in five minutes gets 429 with Retry-After and sends no mail", async () => {
    const visitor = new Visitor(server.url);
    const statuses: number[] = [];
    for (let i = 0; i < 6; i++) statuses.push((await visitor.postForm("/forgot-password", { email: "viewer@example.com" })).status);
    expect(statuses).toEqual([200, 200, 200, 200, 200, 429]);
    const limited = await visitor.postForm("/forgot-password", { email: "viewer@example.com" });
    expect(limited.status).toBe(429);
    const retryAfter = Number(limited.headers.get("retry-after"));
    expect(retryAfter).toBeGreaterThan(60);
    expect(retryAfter).toBeLessThanOrEqual(300);
    expect(await pageText(limited)).toContain("Too many requests. Wait a few minutes, then try again.");
    const { db } = await import("../../app/.server/db/client");
    const { sql } = await import("drizzle-orm");
    const mails = await db().execute<{ n: number }>(sql`select count(*)::int as n from outbox where payload->>'to' = 'viewer@example.com' and kind = 'mail'`);
    expect(mails.rows[0]!.n).toBe(5);
  });
});

describe("the API limiter against PostgreSQL", () => {
  it("lets exactly the limit through when requests race, across connections", async () => {
    const { consumeRateLimit } = await import("../../app/.server/rate-limit");
    const decisions = await Promise.all(Array.from({ length: 25 }, () => consumeRateLimit("race-test", 10, 3600)));
    expect(decisions.filter((d) => d.allowed)).toHaveLength(10);
    expect(decisions.filter((d) => !d.allowed).every((d) => d.retryAfter > 0 && d.retryAfter <= 3600)).toBe(true);
    expect(Math.min(...decisions.map((d) => d.remaining))).toBe(0);
  });

  it("starts counting afresh once a key's window has passed", async () => {
    const { consumeRateLimit } = await import("../../app/.server/rate-limit");
    expect((await consumeRateLimit("window-test", 1, 1)).allowed).toBe(true);
    const refused = await consumeRateLimit("window-test", 1, 1);
    expect(refused).toMatchObject({ allowed: false, remaining: 0, retryAfter: 1 });
    await new Promise((r) => setTimeout(r, 1_100));
    expect((await consumeRateLimit("window-test", 1, 1)).allowed).toBe(true);
  });
});
