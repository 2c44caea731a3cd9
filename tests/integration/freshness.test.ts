import { describe, expect, it } from "vitest";
import { startOwnServer } from "../support/own-server";
import { pageText, teamWithRoles, Visitor } from "../support/http";
import { serverQuery } from "../support/server-db";

// Every page is rendered for the reader who asks, from the database as it is now: nothing a
// reader sees is kept per reader on a server, so every change shows on the next view.

const SOURCE = `## DC link for the freshness test

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
  expect(response.status).toBe(200);
  return (await pageText(response)).replace(/<[^>]+>/g, " ");
}

/** The session cookie's `name=value` pair of a signed-in visitor. */
function sessionCookie(visitor: Visitor): string {
  return /better-auth\.session_token=[^;]+/.exec(visitor.cookieHeader())![0];
}

describe("pages show the database as it is now", () => {
  it("shows every change on the next view: a comment, a stamp, a renamed author and a new role written in SQL", async () => {
    const { teamId, people } = await teamWithRoles("fresh-change", ["engineer", "checker", "viewer"]);
    const author = people.engineer!;
    const viewer = people.viewer!.visitor;
    const label = await sheetWithRevision(author.visitor, "Changing DC link");
    const before = await view(viewer, `/sheets/${label}`);
    expect(before).not.toContain("Ripple looks tight for the freshness test.");
    expect(before).not.toContain("Reuse as a new sheet");

    expect((await people.checker!.visitor.postForm(`/sheets/${label}`, { intent: "comment", anchor: "block:dc1", body: "Ripple looks tight for the freshness test." })).status).toBe(200);
    expect(await view(viewer, `/sheets/${label}`)).toContain("Ripple looks tight for the freshness test.");

    expect((await author.visitor.postForm(`/sheets/${label}`, { intent: "submit", checkerId: people.checker!.userId })).status).toBe(200);
    expect((await people.checker!.visitor.postForm(`/sheets/${label}`, { intent: "stamp" })).status).toBe(200);
    expect(await view(viewer, `/sheets/${label}`)).toMatch(/Verified/);

    // Writes outside the app (an administrator's SQL) show as well.
    await serverQuery(`update "user" set name = 'Renamed Author For Freshness' where id = $1`, [author.userId]);
    expect(await view(viewer, `/sheets/${label}`)).toContain("Renamed Author For Freshness");
    await serverQuery(`update member set role = 'engineer' where user_id = $1 and organization_id = $2`, [people.viewer!.userId, teamId]);
    expect(await view(viewer, `/sheets/${label}`)).toContain("Reuse as a new sheet");
  });

  it("shows a citation's new state on a document page as soon as the cited sheet is submitted", async () => {
    const { teamId, people } = await teamWithRoles("fresh-doc", ["engineer", "checker"]);
    const author = people.engineer!.visitor;
    const label = await sheetWithRevision(author, "Cited DC link");
    expect((await author.postForm("/projects", { code: "FRESH-1", name: "Freshness project", client: "", description: "" })).status).toBe(302);
    const [project] = await serverQuery<{ id: string }>(`select id from project where team_id = $1 and code = 'FRESH-1'`, [teamId]);
    const created = await author.postForm("/documents/new", { title: "Freshness report", projectId: project!.id });
    const number = created.headers.get("location")!.split("/")[2]!;
    const saved = await author.postForm(`/documents/${number}/edit`, { intent: "save", source: `The link is sized in <Cite sheet="${label}" rev="A" />.\n`, baseVersionId: "", note: "" });
    expect(saved.status).toBe(302);
    expect(await view(author, `/documents/${number}`)).not.toContain("waiting for check");
    expect((await author.postForm(`/sheets/${label}`, { intent: "submit", checkerId: people.checker!.userId })).status).toBe(200);
    expect(await view(author, `/documents/${number}`)).toContain("waiting for check");
  });

  it("renders each reader's own page and never another team's sheet", async () => {
    const mine = await teamWithRoles("fresh-mine", ["engineer", "viewer", "viewer2"]);
    const other = await teamWithRoles("fresh-other", ["engineer"]);
    const label = await sheetWithRevision(mine.people.engineer!.visitor, "Team-private DC link");
    expect(await view(mine.people.viewer!.visitor, `/sheets/${label}`)).toContain("Test fresh-mine-viewer ");
    const second = await view(mine.people.viewer2!.visitor, `/sheets/${label}`);
    expect(second).toContain("Test fresh-mine-viewer2");
    expect(second).not.toContain("Test fresh-mine-viewer ");
    // Numbers are per team: the same number in the other team is that team's own sheet, or none.
    const stranger = await other.people.engineer!.visitor.get(`/sheets/${label}`);
    expect(await pageText(stranger)).not.toContain("Team-private DC link");
  });

  it("never shows one user another's page when a request carries two session cookies of the same name", async () => {
    const larkfield = await teamWithRoles("fresh-twocookie-a", ["viewer"]);
    const other = await teamWithRoles("fresh-twocookie-b", ["engineer"]);
    const label = await sheetWithRevision(larkfield.people.admin!.visitor, "Only for the first team");
    const reader = larkfield.people.viewer!.visitor;
    const outsider = other.people.engineer!.visitor;
    expect(await view(reader, `/sheets/${label}`)).toContain("Only for the first team");

    // Both orders: whichever session the auth library reads, the page is that person's own.
    for (const cookies of [[reader, outsider], [outsider, reader]]) {
      const response = await fetch(new URL(`/sheets/${label}`, reader.baseUrl), { headers: { cookie: cookies.map(sessionCookie).join("; ") }, redirect: "manual" });
      const text = await pageText(response);
      if (text.includes("Only for the first team")) {
        expect(text).toContain("Test fresh-twocookie-a-viewer");
        expect(text).not.toContain("Test fresh-twocookie-b-engineer");
      }
      // …and the outsider's own request afterwards gets their own answer, never the first team's sheet.
      expect(await pageText(await outsider.get(`/sheets/${label}`))).not.toContain("Only for the first team");
    }
  });

  it("answers a data request with data, never a page, however often it is asked", async () => {
    const viewer = await new Visitor().signIn("viewer@example.com");
    for (let i = 0; i < 3; i++) {
      const response = await viewer.get("/sheets/CS-0002.data");
      expect(response.status).toBe(200);
      expect(response.headers.get("content-type")).not.toMatch(/text\/html/);
      const body = await response.text();
      expect(body).not.toMatch(/<html|<!DOCTYPE/i);
      expect(body).toContain("CS-0002");
    }
  });

  it("keeps servers in step: a comment or a stamp made through one server shows at once on another", async () => {
    // A second server on the suite's own server database.
    const second = await startOwnServer({ env: { DATABASE_URL: process.env.TEST_SERVER_DATABASE_URL! } });
    try {
      const { people } = await teamWithRoles("fresh-servers", ["engineer", "checker", "viewer"]);
      const label = await sheetWithRevision(people.engineer!.visitor, "DC link read on two servers");
      const onSecond = async () => {
        const response = await fetch(new URL(`/sheets/${label}`, second.url), { headers: { cookie: people.viewer!.visitor.cookieHeader() }, redirect: "manual" });
        expect(response.status).toBe(200);
        return (await pageText(response)).replace(/<[^>]+>/g, " ");
      };
      expect(await onSecond()).toContain("DC link read on two servers");
      expect((await people.checker!.visitor.postForm(`/sheets/${label}`, { intent: "comment", anchor: "block:dc1", body: "Seen from the other server." })).status).toBe(200);
      expect(await onSecond()).toContain("Seen from the other server.");
      expect((await people.engineer!.visitor.postForm(`/sheets/${label}`, { intent: "submit", checkerId: people.checker!.userId })).status).toBe(200);
      expect((await people.checker!.visitor.postForm(`/sheets/${label}`, { intent: "stamp" })).status).toBe(200);
      expect(await onSecond()).toMatch(/Verified/);
    } finally {
      await second.stop();
    }
  });
});
