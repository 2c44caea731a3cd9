import { describe, expect, it } from "vitest";
import { pageText, signUpWithTeam, teamWithRoles, type Visitor } from "../support/http";
import { serverQuery } from "../support/server-db";

const SOURCE = `## DC link

<DcLink id="dc1" p="3 kW" vdc="400 V" f="50 Hz" rippleVpp="8 V" />
`;

async function newProject(visitor: Visitor, code: string) {
  const created = await visitor.postForm("/projects", { code, name: `Project ${code}`, client: "", description: "" });
  expect(created.status).toBe(302);
}

async function newSheet(author: Visitor, title: string) {
  const created = await author.postForm("/sheets/new", { title, projectId: "", tags: "" });
  return created.headers.get("location")!.split("/")[2]!;
}

async function saveRevision(author: Visitor, teamId: string, label: string, source: string) {
  const base = await latestRevision(teamId, label);
  const saved = await author.postForm(`/sheets/${label}/edit`, { intent: "save", source, baseRevisionId: base?.id ?? "", note: "" });
  expect(saved.status).toBe(302);
  return (await latestRevision(teamId, label))!;
}

async function latestRevision(teamId: string, label: string) {
  const [row] = await serverQuery<{ id: string; state: string; label: string }>(
    `select r.id, r.state, r.label from sheet_revision r join calc_sheet s on s.latest_revision_id = r.id where s.team_id = $1 and s.number = $2`,
    [teamId, Number(label.slice(3))],
  );
  return row;
}

async function newDocument(author: Visitor, teamId: string, code: string, title: string, source: string) {
  const [project] = await serverQuery<{ id: string }>(`select id from project where team_id = $1 and code = $2`, [teamId, code]);
  const created = await author.postForm("/documents/new", { title, projectId: project!.id });
  expect(created.status).toBe(302);
  const label = created.headers.get("location")!.split("/")[2]!;
  const saved = await author.postForm(`/documents/${label}/edit`, { intent: "save", source, baseVersionId: "", note: "first issue" });
  expect(saved.status).toBe(302);
  const [document] = await serverQuery<{ id: string }>(`select id from project_document where team_id = $1 and number = $2`, [teamId, Number(label.slice(3))]);
  return { label, id: document!.id };
}

async function documentSources(documentId: string) {
  return serverQuery<{ sequence: number; source: string; note: string }>(`select sequence, source, note from document_version where document_id = $1 order by sequence`, [documentId]);
}

describe("project documents and their citations", () => {
  it("follows a citation from verified to superseded, and the project panel's update moves it to the new verified revision (audited)", async () => {
    const { teamId, people } = await teamWithRoles("cite", ["engineer", "checker", "viewer"]);
    const author = people.engineer!.visitor;
    const checker = people.checker!;
    await newProject(author, "CITE-1");
    const sheet = await newSheet(author, "DC link for the citation test");
    await saveRevision(author, teamId, sheet, SOURCE);
    await author.postForm(`/sheets/${sheet}`, { intent: "submit", checkerId: checker.userId });
    expect((await checker.visitor.postForm(`/sheets/${sheet}`, { intent: "stamp" })).status).toBe(200);

    const document = await newDocument(author, teamId, "CITE-1", "Design report", `## Basis\n\nThe link is sized in <Cite sheet="${sheet}" rev="A" />; the filter in <Cite sheet="CS-0999" rev="A" />.\n`);
    let page = await pageText(await author.get(`/documents/${document.label}`));
    expect(page).toContain("References");
    expect(page).toMatch(new RegExp(`\\[1\\].*${sheet} rev A.*DC link for the citation test.*Verified`, "s"));
    expect(page).toContain("stamped");
    expect(page).toMatch(/\[2\].*CS-0999 rev A.*Not found.*no such sheet in this team/s);

    // A new revision that is not yet verified leaves the citation standing.
    await saveRevision(author, teamId, sheet, SOURCE.replace("8 V", "10 V"));
    await author.postForm(`/sheets/${sheet}`, { intent: "submit", checkerId: checker.userId });
    page = await pageText(await author.get(`/projects/CITE-1`));
    expect(page).not.toContain(`cites ${sheet} rev A`);
    expect(page).toContain("cites CS-0999 rev A");

    // Once B is verified, A is superseded: the document says so and the project panel offers the update.
    expect((await checker.visitor.postForm(`/sheets/${sheet}`, { intent: "stamp" })).status).toBe(200);
    page = await pageText(await author.get(`/documents/${document.label}`));
    expect(page).toContain("superseded by revision B (verified)");
    page = await pageText(await author.get(`/projects/CITE-1`));
    expect(page).toContain(`cites ${sheet} rev A`);
    expect(page).toContain("Update to rev B");

    // A viewer of the project sees the panel but may not update.
    const viewer = people.viewer!.visitor;
    expect(await pageText(await viewer.get(`/projects/CITE-1`))).not.toContain("Update to rev B");
    const refused = await viewer.postForm(`/projects/CITE-1`, { intent: "update-citation", documentId: document.id, sheet, rev: "A" });
    expect(refused.status).toBe(403);
    expect(await documentSources(document.id)).toHaveLength(1);

    const update = await author.postForm(`/projects/CITE-1`, { intent: "update-citation", documentId: document.id, sheet, rev: "A" });
    expect(update.status).toBe(200);
    expect(await pageText(update)).toContain(`${document.label} now cites ${sheet} rev B (was A); saved as version 2.`);
    const versions = await documentSources(document.id);
    expect(versions.map((v) => v.sequence)).toEqual([1, 2]);
    expect(versions[0]!.source).toContain(`<Cite sheet="${sheet}" rev="A" />`);
    expect(versions[1]!.source).toBe(versions[0]!.source.replace(`rev="A" />;`, `rev="B" />;`));
    expect(versions[1]!.note).toBe(`Citation ${sheet} moved from revision A (superseded) to B, its newest verified revision.`);
    const [audit] = await serverQuery<{ detail: { sheet: string; from: string; to: string; reason: string; version: number } }>(
      `select detail from audit_event where action = 'document.citation-updated' and subject_id = $1`,
      [document.id],
    );
    expect(audit!.detail).toEqual({ sheet, from: "A", to: "B", reason: "superseded", version: 2 });
    page = (await pageText(await author.get(`/documents/${document.label}`))).match(/References[\s\S]*/)![0];
    expect(page).toMatch(new RegExp(`\\[1\\].*${sheet} rev B.*Verified`, "s"));
    expect(page).not.toContain("superseded by revision");

    // The old version keeps its citation as it was: a permanent record.
    expect(await pageText(await author.get(`/documents/${document.label}/versions/1`))).toContain(`${sheet} rev A`);
    await expect(serverQuery(`update document_version set source = '' where document_id = $1`, [document.id])).rejects.toThrow(/append-only/);

    // Nothing more to update: a second click is refused with a reason, and nothing is saved.
    const again = await author.postForm(`/projects/CITE-1`, { intent: "update-citation", documentId: document.id, sheet, rev: "A" });
    expect(again.status).toBe(400);
    expect(await pageText(again)).toContain(`no longer cites ${sheet} revision A`);
    expect(await documentSources(document.id)).toHaveLength(2);
  });

  it("names each state of a cited revision: draft, awaiting check, returned, and a re-check after an engine change", async () => {
    const { teamId, people } = await teamWithRoles("states", ["engineer", "checker"]);
    const author = people.engineer!.visitor;
    const checker = people.checker!;
    await newProject(author, "STATES");
    const sheet = await newSheet(author, "Sheet whose citation changes state");
    await saveRevision(author, teamId, sheet, SOURCE);
    const document = await newDocument(author, teamId, "STATES", "Review pack", `See <Cite sheet="${sheet}" rev="A" />.\n`);
    const reference = async () => (await pageText(await author.get(`/documents/${document.label}`))).match(/References[\s\S]*/)![0];

    expect(await reference()).toContain("draft, not yet sent for check");
    await author.postForm(`/sheets/${sheet}`, { intent: "submit", checkerId: checker.userId });
    expect(await reference()).toContain("waiting for check");
    await checker.visitor.postForm(`/sheets/${sheet}`, { intent: "comment", anchor: "sheet", body: "Ripple target missing." });
    await checker.visitor.postForm(`/sheets/${sheet}`, { intent: "return" });
    expect(await reference()).toContain("returned by the checker");

    // No verified revision yet: the update is refused with the reason, and nothing is saved.
    const early = await author.postForm(`/documents/${document.label}`, { intent: "update-citation", documentId: document.id, sheet, rev: "A" });
    expect(early.status).toBe(400);
    expect(await pageText(early)).toContain(`${sheet} has no verified revision yet`);
    expect(await documentSources(document.id)).toHaveLength(1);

    // B verified, cited; then its stamp is made to read as given under an older engine.
    const b = await saveRevision(author, teamId, sheet, SOURCE.replace("8 V", "10 V"));
    await author.postForm(`/sheets/${sheet}`, { intent: "submit", checkerId: checker.userId });
    await checker.visitor.postForm(`/sheets/${sheet}`, { intent: "stamp" });
    expect((await author.postForm(`/documents/${document.label}`, { intent: "update-citation", documentId: document.id, sheet, rev: "A" })).status).toBe(200);
    expect(await reference()).toMatch(new RegExp(`${sheet} rev B[\\s\\S]*Verified`));
    // Only the guard that keeps stamps permanent is lifted.
    await serverQuery(`alter table stamp disable trigger stamp_permanent`);
    try {
      await serverQuery(`update stamp set engine_version = '0.9.0' where revision_id = $1`, [b.id]);
    } finally {
      await serverQuery(`alter table stamp enable trigger stamp_permanent`);
    }
    const text = await reference();
    expect(text).toContain("Needs re-check");
    expect(text).toMatch(/needs a re-check after the engine changed \(0\.9\.0 → \d+\.\d+\.\d+; results unchanged\)/);
    expect(await pageText(await author.get(`/projects/STATES`))).toContain(`cites ${sheet} rev B`);
  });

  it("refuses calculators and unsafe MDX in a document with the line to fix, saving nothing", async () => {
    const { teamId, people } = await teamWithRoles("docmdx", ["engineer"]);
    const author = people.engineer!.visitor;
    await newProject(author, "DOCMDX");
    const [project] = await serverQuery<{ id: string }>(`select id from project where team_id = $1`, [teamId]);
    const created = await author.postForm("/documents/new", { title: "Report", projectId: project!.id });
    const label = created.headers.get("location")!.split("/")[2]!;
    for (const [source, message] of [
      ['Ripple:\n\n<DcLink id="dc1" />\n', /line 3, column 1:.*Calculations belong in calc sheets/],
      ["Hello <script>alert(1)</script>\n", /line 1/],
    ] as const) {
      const saved = await author.postForm(`/documents/${label}/edit`, { intent: "save", source, baseVersionId: "", note: "" });
      expect(saved.status).toBe(400);
      expect(await pageText(saved)).toMatch(message);
    }
    const [{ count }] = (await serverQuery<{ count: string }>(`select count(*) from document_version v join project_document d on d.id = v.document_id where d.team_id = $1`, [teamId])) as [{ count: string }];
    expect(Number(count)).toBe(0);

    const missingTitle = await author.postForm("/documents/new", { title: "", projectId: project!.id });
    expect(missingTitle.status).toBe(400);
    expect(await pageText(missingTitle)).toContain("Give the document a title");
    const noProject = await author.postForm("/documents/new", { title: "Report two", projectId: "" });
    expect(noProject.status).toBe(400);
    expect(await pageText(noProject)).toContain("Choose the project this document belongs to.");
  });

  it("keeps documents to their team: another team gets 404, and their search never shows them", async () => {
    const { teamId, people } = await teamWithRoles("docteam", ["engineer"]);
    const author = people.engineer!.visitor;
    await newProject(author, "PRIV");
    const document = await newDocument(author, teamId, "PRIV", "Quarantined capacitor bank report", "The bank uses zorblite capacitors.\n");
    const outsider = (await signUpWithTeam("docteam-outsider")).visitor;
    expect((await outsider.get(`/documents/${document.label}`)).status).toBe(404);
    expect((await outsider.get(`/documents/${document.label}/edit`)).status).toBe(404);
    const search = (await (await outsider.get(`/api/v1/search?q=zorblite`)).json()) as { hits: unknown[] };
    expect(search.hits).toEqual([]);

    // In its own team, search finds the document by its prose and links to its version.
    const own = (await (await author.get(`/api/v1/search?q=zorblite`)).json()) as { hits: { kind: string; document: string; url: string }[] };
    expect(own.hits).toEqual([expect.objectContaining({ kind: "document", document: document.label, url: `/documents/${document.label}/versions/1` })]);
  });

  it("shows where a sheet is cited, on the sheet's page", async () => {
    const { teamId, people } = await teamWithRoles("citedin", ["engineer"]);
    const author = people.engineer!.visitor;
    await newProject(author, "CITEDIN");
    const sheet = await newSheet(author, "Cited sheet");
    await saveRevision(author, teamId, sheet, SOURCE);
    const document = await newDocument(author, teamId, "CITEDIN", "Report that cites", `See <Cite sheet="${sheet}" rev="A" />.\n`);
    const page = await pageText(await author.get(`/sheets/${sheet}`));
    expect(page).toMatch(new RegExp(`Cited in:.*href="/documents/${document.label}"[^>]*>${document.label}</a> Report that cites \\(CITEDIN, rev A\\)`, "s"));
  });
});
