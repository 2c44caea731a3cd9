import { matchPath } from "react-router";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ACCESS_MATRIX, ACTORS, entryUrl, type Actor, type Body, type Fixtures, type Outcome } from "../support/access-matrix";
import { signUpWithTeam, Visitor } from "../support/http";
import type { SpawnedServer } from "../support/app-server";
import { SEEDED_SERVER_TIMEOUT_MS, startOwnServer } from "../support/own-server";
import { appRoutes } from "../support/route-config";

/**
 * Checks the access matrix (tests/support/access-matrix.ts) route by route, for anonymous,
 * each role and a member of another team, against a server of its own on a freshly seeded
 * demo database, so a refused action can be shown to have changed nothing in the database.
 */

/** Every row of every table, as one hash per table; counters and sessions are left out (reading pages touches them). */
async function databaseFingerprint(): Promise<Record<string, string>> {
  const { db } = await import("../../app/.server/db/client");
  const { sql } = await import("drizzle-orm");
  const tables = await db().execute<{ name: string }>(
    sql`select table_name as name from information_schema.tables where table_schema = 'public' and table_type = 'BASE TABLE' and table_name not in ('session', 'rate_limit', 'api_rate_limit')`,
  );
  const fingerprint: Record<string, string> = {};
  for (const { name } of tables.rows) {
    // Left out: when an API key was last used, and the outbox worker's delivery bookkeeping,
    // which move on their own while the matrix runs; no refused request causes either.
    const row = sql`(to_jsonb(t) - 'last_used_at' - 'sent_at' - 'attempts' - 'next_attempt_at' - 'last_error')::text`;
    const rows = await db().execute<{ digest: string }>(
      sql`select count(*) || ':' || coalesce(md5(string_agg(md5(${row}), '' order by md5(${row}))), '') as digest from ${sql.identifier(name)} t`,
    );
    fingerprint[name] = rows.rows[0]!.digest;
  }
  return fingerprint;
}

function describeOutcome(response: Response): Outcome {
  const location = response.headers.get("location") ?? "";
  if (response.status === 302 && location.startsWith("/sign-in?next=")) return "sign-in";
  return response.status;
}

function personalise(body: Body, actor: Actor): Body {
  const text = JSON.stringify("form" in body ? body.form : body.json).replaceAll("{actor}", actor);
  return "form" in body ? { form: JSON.parse(text) } : { json: JSON.parse(text) };
}

describe("access matrix", () => {
  let server: SpawnedServer;
  const visitors = new Map<Actor, Visitor>();
  let fixtures: Fixtures;

  async function signInAs(actor: Actor): Promise<Visitor> {
    if (actor === "anonymous") return new Visitor(server.url);
    if (actor === "outsider") return (await signUpWithTeam("matrix-outsider", server.url)).visitor;
    return new Visitor(server.url).signIn(`${actor}@example.com`);
  }

  beforeAll(async () => {
    // As in production: no development pages.
    server = await startOwnServer({ seed: true, env: { DEV_PAGES: "0" } });
    for (const actor of ACTORS) visitors.set(actor, await signInAs(actor));
    // An invitation to the demo team, for someone who is none of the actors.
    const invited = await visitors.get("admin")!.postForm("/team", { intent: "invite", email: "matrix-invitee@example.org", role: "viewer" });
    expect(invited.status).toBe(200);
    const { db } = await import("../../app/.server/db/client");
    const { sql } = await import("drizzle-orm");
    const rows = await db().execute<{ id: string }>(sql`select id from invitation where email = 'matrix-invitee@example.org'`);
    const attachments = await db().execute<{ id: string }>(sql`select a.id from attachment a join calc_sheet s on s.id = a.sheet_id join organization o on o.id = s.team_id where s.number = 6 and o.slug = 'larkfield-power' limit 1`);
    fixtures = { invitationId: rows.rows[0]!.id, attachmentId: attachments.rows[0]!.id };
  }, SEEDED_SERVER_TIMEOUT_MS);
  afterAll(async () => {
    await server?.stop();
  });

  it("has one entry for every route in app/routes.ts, each with a URL its route answers", () => {
    const missing = appRoutes.filter((r) => !(r.id in ACCESS_MATRIX)).map((r) => `${r.id} (${r.file}, ${r.pattern ?? "layout"})`);
    expect(missing, `Add an access-matrix entry (one line in tests/support/access-matrix.ts) for: ${missing.join("; ")}`).toEqual([]);
    const stale = Object.keys(ACCESS_MATRIX).filter((id) => !appRoutes.some((r) => r.id === id));
    expect(stale, `These access-matrix entries name routes that no longer exist: ${stale.join(", ")}`).toEqual([]);
    for (const route of appRoutes) {
      const entry = ACCESS_MATRIX[route.id]!;
      if (route.hasAction) expect(entry.post, `${route.id} has an action: give its entry a post rule and body`).toBeDefined();
      else expect(entry.post, `${route.id} has no action: drop the post rule from its entry`).toBeUndefined();
      if (route.pattern) {
        const url = entryUrl(entry, { invitationId: "x", attachmentId: "x" });
        expect(matchPath(route.pattern, url.split("?")[0]!), `${route.id}: ${url} does not match ${route.pattern}`).not.toBeNull();
      }
    }
  });

  for (const route of appRoutes) {
    const entry = ACCESS_MATRIX[route.id];
    if (!entry) continue;
    it(`${route.id}: GET ${typeof entry.url === "string" ? entry.url : route.pattern}`, async () => {
      const url = entryUrl(entry, fixtures);
      const seen: Record<string, Outcome> = {};
      const expected: Record<string, Outcome> = {};
      for (const actor of ACTORS) {
        const response = await visitors.get(actor)!.get(url);
        expected[actor] = entry.get(actor);
        seen[actor] = describeOutcome(response);
        if (url.startsWith("/api/") && expected[actor] === "sign-in") {
          expected[actor] = 401;
          if (response.status === 401) expect((await response.json()).error).toMatch(/Sign in/);
        }
        if (!response.bodyUsed) await response.body?.cancel();
      }
      expect(seen).toEqual(expected);
    });

    const post = entry.post;
    if (!post) continue;
    it(`${route.id}: POST ${post.url ?? (typeof entry.url === "string" ? entry.url : route.pattern)}`, async () => {
      const url = post.url ?? entryUrl(entry, fixtures);
      const seen: Record<string, Outcome> = {};
      const expected: Record<string, Outcome> = {};
      for (const actor of ACTORS) {
        expected[actor] = post.rule(actor);
        if (url.startsWith("/api/") && expected[actor] === "sign-in") expected[actor] = 401;
        const refused = ["sign-in", 401, 403, 404].includes(expected[actor]!);
        const before = refused ? await databaseFingerprint() : null;
        const body = personalise(post.body, actor);
        const visitor = visitors.get(actor)!;
        const response = "form" in body ? await visitor.postForm(url, body.form) : await visitor.postJson(url, body.json);
        seen[actor] = describeOutcome(response);
        if (url.startsWith("/api/") && typeof seen[actor] === "number" && seen[actor] >= 400) {
          const answer = await response.json();
          // better-auth's own endpoints say `message`; ours say `error`.
          expect(answer.error ?? answer.message, `${actor} POST ${url}: a JSON error with words`).toEqual(expect.any(String));
        }
        if (!response.bodyUsed) await response.body?.cancel();
        if (before) expect(await databaseFingerprint(), `${actor} was refused POST ${url}, yet the database changed`).toEqual(before);
        if (post.endsSession && actor !== "anonymous") visitors.set(actor, await signInAs(actor));
      }
      expect(seen).toEqual(expected);
    });
  }
});
