import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { freePort, spawnServer } from "../support/app-server";
import { pageText, teamWithRoles, type Visitor } from "../support/http";
import { serverQuery } from "../support/server-db";

const { TABLES_PAGES_DO_NOT_SHOW } = await import("../../app/.server/page-cache");

const SOURCE = `## DC link for the cache test

<DcLink id="dc1" p="3 kW" vdc="400 V" f="50 Hz" rippleVpp="8 V" />
`;

async function sheetWithRevision(author: Visitor, title: string) {
  const created = await author.postForm("/sheets/new", { title, projectId: "", tags: "" });
  const label = created.headers.get("location")!.split("/")[2]!;
  const saved = await author.postForm(`/sheets/${label}/edit`, { intent: "save", source: SOURCE, baseRevisionId: "", note: "" });
  expect(saved.status).toBe(302);
  return label;
}

async function view(visitor: Visitor, path: string) {
  const response = await visitor.get(path);
  const html = await response.text();
  return { response, html, cache: response.headers.get("x-page-cache"), text: html.replace(/<[^>]+>/g, " ") };
}

describe("rendered-page cache", () => {
  it("serves a second view of an unchanged sheet from the cache: the same page, its scripts allowed by hash, compressed as asked", async () => {
    const { people } = await teamWithRoles("pagecache-hit", ["engineer", "viewer"]);
    const label = await sheetWithRevision(people.engineer!.visitor, "Cached DC link");
    const viewer = people.viewer!.visitor;
    const first = await view(viewer, `/sheets/${label}`);
    const second = await view(viewer, `/sheets/${label}`);
    expect(first.cache).toBe("miss");
    expect(second.cache).toBe("hit");
    expect(second.response.status).toBe(200);
    expect(second.text).toContain("Cached DC link");
    expect(second.html).toBe(first.html);

    // The first answer's nonce is not reused: the policy allows exactly this page's inline scripts, by SHA-256.
    const policy = second.response.headers.get("content-security-policy")!;
    expect(policy).not.toContain("'nonce-");
    const inline = [...second.html.matchAll(/<script(?![^>]*\ssrc=)[^>]*>([\s\S]*?)<\/script>/g)].map((m) => m[1]!);
    expect(inline.length).toBeGreaterThan(0);
    for (const script of inline) expect(policy).toContain(`'sha256-${createHash("sha256").update(script).digest("base64")}'`);
    expect(policy).toContain("frame-ancestors 'none'");
    expect(second.response.headers.get("x-content-type-options")).toBe("nosniff");
    expect(second.response.headers.get("x-request-id")).toMatch(/^[0-9a-f-]{36}$/);
    expect(second.response.headers.get("x-request-id")).not.toBe(first.response.headers.get("x-request-id"));

    // Sent compressed, as kept, when the browser asks (plain when it takes neither); the same page once decoded.
    for (const encoding of ["gzip", "br", "identity"]) {
      const raw = await viewer.get(`/sheets/${label}`, { "accept-encoding": encoding });
      expect(raw.headers.get("x-page-cache")).toBe("hit");
      expect(raw.headers.get("content-encoding")).toBe(encoding === "identity" ? null : encoding);
      expect(await raw.text()).toBe(first.html);
    }
  });

  it("shows every change at once: a comment, a stamp, a renamed author, a new role, a write made straight in the database", async () => {
    const { teamId, people } = await teamWithRoles("pagecache-change", ["engineer", "checker", "viewer"]);
    const author = people.engineer!;
    const viewer = people.viewer!.visitor;
    const label = await sheetWithRevision(author.visitor, "Changing DC link");
    await view(viewer, `/sheets/${label}`);
    expect((await view(viewer, `/sheets/${label}`)).cache).toBe("hit");

    // A comment through the page.
    expect((await people.checker!.visitor.postForm(`/sheets/${label}`, { intent: "comment", anchor: "block:dc1", body: "Ripple looks tight for the cache test." })).status).toBe(200);
    const afterComment = await view(viewer, `/sheets/${label}`);
    expect(afterComment.cache).toBe("miss");
    expect(afterComment.text).toContain("Ripple looks tight for the cache test.");

    // Submitted and stamped: the viewer sees the stamp on the next view.
    expect((await author.visitor.postForm(`/sheets/${label}`, { intent: "submit", checkerId: people.checker!.userId })).status).toBe(200);
    expect((await people.checker!.visitor.postForm(`/sheets/${label}`, { intent: "stamp" })).status).toBe(200);
    expect(await pageText(await viewer.get(`/sheets/${label}`))).toMatch(/Verified/);

    // A write outside the app (an administrator's SQL) is seen too: the triggers move the version.
    await view(viewer, `/sheets/${label}`);
    await serverQuery(`update "user" set name = 'Renamed Author For Cache' where id = $1`, [author.userId]);
    const renamed = await view(viewer, `/sheets/${label}`);
    expect(renamed.cache).toBe("miss");
    expect(renamed.text).toContain("Renamed Author For Cache");

    // A new role is part of who is asking: the engineer-only actions appear at once.
    await view(viewer, `/sheets/${label}`);
    await serverQuery(`update member set role = 'engineer' where user_id = $1 and organization_id = $2`, [people.viewer!.userId, teamId]);
    const promoted = await view(viewer, `/sheets/${label}`);
    expect(promoted.cache).toBe("miss");
    expect(promoted.text).toContain("Reuse as a new sheet");
  });

  it("keeps one reader's page from another and is not moved by another team's writes", async () => {
    const mine = await teamWithRoles("pagecache-mine", ["engineer", "viewer", "viewer2"]);
    const other = await teamWithRoles("pagecache-other", ["engineer"]);
    const label = await sheetWithRevision(mine.people.engineer!.visitor, "Team-private DC link");
    await view(mine.people.viewer!.visitor, `/sheets/${label}`);
    // Another reader renders their own page (their name is on it), never the first reader's.
    const second = await view(mine.people.viewer2!.visitor, `/sheets/${label}`);
    expect(second.cache).toBe("miss");
    expect(second.text).not.toContain("Test pagecache-mine-viewer ");
    // Another team's save leaves this team's pages cached.
    await sheetWithRevision(other.people.engineer!.visitor, "Other team's sheet");
    expect((await view(mine.people.viewer!.visitor, `/sheets/${label}`)).cache).toBe("hit");
    // And a member of that other team still gets no page of this one.
    // (numbers are per team: the same number there is that team's own sheet).
    const stranger = await view(other.people.engineer!.visitor, `/sheets/${label}`);
    expect(stranger.text).not.toContain("Team-private DC link");
  });

  it("caches a project document page and shows a citation's new state once the cited sheet changes", async () => {
    const { teamId, people } = await teamWithRoles("pagecache-doc", ["engineer", "checker"]);
    const author = people.engineer!.visitor;
    const label = await sheetWithRevision(author, "Cited DC link");
    expect((await author.postForm("/projects", { code: "CACHE-1", name: "Cache test project", client: "", description: "" })).status).toBe(302);
    const [project] = await serverQuery<{ id: string }>(`select id from project where team_id = $1 and code = 'CACHE-1'`, [teamId]);
    const created = await author.postForm("/documents/new", { title: "Cache test report", projectId: project!.id });
    expect(created.status).toBe(302);
    const number = created.headers.get("location")!.split("/")[2]!;
    const saved = await author.postForm(`/documents/${number}/edit`, { intent: "save", source: `The link is sized in <Cite sheet="${label}" rev="A" />.\n`, baseVersionId: "", note: "" });
    expect(saved.status).toBe(302);
    await view(author, `/documents/${number}`);
    const again = await view(author, `/documents/${number}`);
    expect(again.cache).toBe("hit");
    expect(again.text).not.toContain("waiting for check");
    // The cited revision is sent for checking: the document's citation says so on the next view.
    expect((await author.postForm(`/sheets/${label}`, { intent: "submit", checkerId: people.checker!.userId })).status).toBe(200);
    const changed = await view(author, `/documents/${number}`);
    expect(changed.cache).toBe("miss");
    expect(changed.text).toContain("waiting for check");
  });

  it("gives a cached page only to a live, correctly signed session, and still lets the session be extended", async () => {
    const { people } = await teamWithRoles("pagecache-session", ["engineer", "viewer"]);
    const label = await sheetWithRevision(people.engineer!.visitor, "Session-guarded DC link");
    const viewer = people.viewer!.visitor;
    await view(viewer, `/sheets/${label}`);
    expect((await view(viewer, `/sheets/${label}`)).cache).toBe("hit");
    const cookie = viewer.cookieHeader();
    const signed = decodeURIComponent(/better-auth\.session_token=([^;]+)/.exec(cookie)![1]!);
    const token = signed.slice(0, signed.lastIndexOf("."));

    // A forged signature: no page, the framework sends the reader to sign in.
    const forged = cookie.replace(/(better-auth\.session_token=)[^;]+/, `$1${encodeURIComponent(`${token}.${Buffer.alloc(32, 7).toString("base64")}`)}`);
    const refused = await fetch(new URL(`/sheets/${label}`, viewer.baseUrl), { headers: { cookie: forged }, redirect: "manual" });
    expect(refused.status).toBe(302);
    expect(refused.headers.get("location")).toMatch(/^\/sign-in/);

    // A session due for its daily extension is answered by the framework, which extends it.
    await serverQuery(`update session set expires_at = now() + interval '12 days' where token = $1`, [token]);
    const extended = await view(viewer, `/sheets/${label}`);
    expect(extended.response.status).toBe(200);
    const [session] = await serverQuery<{ days: number }>(`select extract(epoch from expires_at - now()) / 86400 as days from session where token = $1`, [token]);
    expect(Number(session!.days)).toBeGreaterThan(13.5);

    // Signed out (the session row is gone): the same cookie gets no page.
    await serverQuery(`delete from session where token = $1`, [token]);
    const after = await fetch(new URL(`/sheets/${label}`, viewer.baseUrl), { headers: { cookie }, redirect: "manual" });
    expect(after.status).toBe(302);
    expect(after.headers.get("x-page-cache")).toBeNull();
  });

  it("keeps servers in step: a change made through one server shows at once on another that had kept the page", async () => {
    const port = String(await freePort());
    const second = await spawnServer({ ...process.env, DATABASE_URL: process.env.TEST_SERVER_DATABASE_URL!, PORT: port, APP_URL: `http://127.0.0.1:${port}`, LOG_LEVEL: "warn" });
    try {
      const { people } = await teamWithRoles("pagecache-servers", ["engineer", "checker", "viewer"]);
      const label = await sheetWithRevision(people.engineer!.visitor, "DC link read on two servers");
      // The viewer's browser, pointed at the second server with the same session.
      const onSecond = async () => {
        const response = await fetch(new URL(`/sheets/${label}`, second.url), { headers: { cookie: people.viewer!.visitor.cookieHeader() }, redirect: "manual" });
        return { cache: response.headers.get("x-page-cache"), text: (await response.text()).replace(/<[^>]+>/g, " ") };
      };
      expect((await onSecond()).cache).toBe("miss");
      expect((await onSecond()).cache).toBe("hit");
      // The checker comments through the first server.
      expect((await people.checker!.visitor.postForm(`/sheets/${label}`, { intent: "comment", anchor: "block:dc1", body: "Seen from the other server." })).status).toBe(200);
      const after = await onSecond();
      expect(after.cache).toBe("miss");
      expect(after.text).toContain("Seen from the other server.");
    } finally {
      await second.stop();
    }
  });

  it("has a content-version trigger on every table a page can show, and names why each other table has none", async () => {
    const tables = await serverQuery<{ name: string; watched: boolean }>(
      `select c.relname as name, exists (select 1 from pg_trigger t where t.tgrelid = c.oid and t.tgname = c.relname || '_content_changed') as watched
       from pg_class c join pg_namespace n on n.oid = c.relnamespace
       where n.nspname = 'public' and c.relkind in ('r', 'p')`,
    );
    expect(tables.length).toBeGreaterThan(20);
    const unaccounted = tables.filter((t) => !t.watched && !(t.name in TABLES_PAGES_DO_NOT_SHOW)).map((t) => t.name);
    expect(unaccounted, "a new table needs a content_changed trigger (migration) or a reason in TABLES_PAGES_DO_NOT_SHOW").toEqual([]);
    const watchedButListed = tables.filter((t) => t.watched && t.name in TABLES_PAGES_DO_NOT_SHOW).map((t) => t.name);
    expect(watchedButListed).toEqual([]);
  });
});
