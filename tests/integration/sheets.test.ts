import { describe, expect, it } from "vitest";
import { signUpWithTeam, Visitor } from "../support/http";
import { serverQuery } from "../support/server-db";
import { expectClose } from "../support/tolerance";
import { evaluateSheet } from "../../app/lib/calc/evaluate-sheet";

const SOURCE = `## Output stage

The bridge runs quasi-square with a zero interval $\\alpha$ at each edge.

<QuasiSquare id="qs1" vdc="48 V" alpha="30 deg" />

$$V_{1,rms} = \\frac{2\\sqrt{2}}{\\pi} V_{dc} \\cos\\alpha$$

<LcFilter id="lc1" l="1 mH" c="10 uF" rLoad="10 ohm" fsw="20 kHz" f="50 Hz" vout="=qs1.v1Rms" />
`;

async function newSheet(visitor: Visitor, title: string, projectId = ""): Promise<string> {
  const response = await visitor.postForm("/sheets/new", { title, projectId, tags: "filter, test" });
  expect(response.status).toBe(302);
  const location = response.headers.get("location")!;
  expect(location).toMatch(/^\/sheets\/CS-\d{4}\/edit$/);
  return location.split("/")[2]!;
}

async function latestRevisionId(label: string, teamName: string): Promise<string | null> {
  const [row] = await serverQuery<{ latest_revision_id: string | null }>(
    `select s.latest_revision_id from calc_sheet s join organization o on o.id = s.team_id where o.name = $1 and s.number = $2`,
    [teamName, Number(label.slice(3))],
  );
  return row?.latest_revision_id ?? null;
}

function save(visitor: Visitor, label: string, source: string, baseRevisionId: string | null, note = "") {
  return visitor.postForm(`/sheets/${label}/edit`, { intent: "save", source, baseRevisionId: baseRevisionId ?? "", note });
}

describe("calc sheets: saving revisions", () => {
  it("stores each block's inputs and server-computed results as rows, with a content hash", async () => {
    const { visitor } = await signUpWithTeam("sheets");
    const label = await newSheet(visitor, "Output stage of the pump inverter");
    const saved = await save(visitor, label, SOURCE, null, "first issue");
    expect(saved.status).toBe(302);
    expect(saved.headers.get("location")).toBe(`/sheets/${label}`);

    const rows = await serverQuery<{ block_id: string; calculator: string; inputs: Record<string, string>; results: Record<string, { value: number }>; ok: boolean; label: string; content_hash: string }>(
      `select b.block_id, b.calculator, b.inputs, b.results, b.ok, r.label, r.content_hash
         from revision_block b join sheet_revision r on r.id = b.revision_id join calc_sheet s on s.id = r.sheet_id join organization o on o.id = s.team_id
        where o.name = 'Team sheets' and s.number = $1 order by b.position`,
      [Number(label.slice(3))],
    );
    expect(rows.map((r) => r.block_id)).toEqual(["qs1", "lc1"]);
    expect(rows.every((r) => r.ok && r.label === "A")).toBe(true);
    expect(rows[1]!.inputs.vout).toBe("=qs1.v1Rms");
    expect(rows[0]!.content_hash).toMatch(/^[0-9a-f]{64}$/);
    // The stored results are the engine's, computed on the server from the typed inputs.
    const engine = evaluateSheet([
      { id: "qs1", calculator: "quasi-square", inputs: { vdc: "48 V", alpha: "30 deg" } },
      { id: "lc1", calculator: "lc-filter", inputs: { l: "1 mH", c: "10 uF", rLoad: "10 ohm", fsw: "20 kHz", f: "50 Hz", vout: "=qs1.v1Rms" } },
    ]);
    const engineLc = engine.blocks.lc1!;
    if (!engineLc.ok) throw new Error("engine failed");
    expectClose(rows[1]!.results.icRms!.value, (engineLc.results.icRms as { value: number }).value, { rel: 1e-12 }, "icRms");
    expectClose(rows[1]!.results.f0!.value, 1591.549430918953, { rel: 1e-9 }, "f0 (derived: 1/(2π√(LC)))");

    const page = await (await visitor.get(`/sheets/${label}`)).text();
    expect(page).toContain("Output stage of the pump inverter");
    expect(page).toContain("Revision history");
    expect(page).toContain("katex");

    // SQL can answer "every lc-filter block with f0 between 1 and 3 kHz".
    const found = await serverQuery<{ block_id: string }>(
      `select block_id from revision_block where calculator = 'lc-filter' and (results->'f0'->>'value')::float8 between 1000 and 3000 and sheet_id = (select sheet_id from revision_block where block_id='lc1' order by id desc limit 1)`,
    );
    expect(found.length).toBeGreaterThan(0);
  });

  it("refuses a save on top of a revision newer than the one opened, and keeps the author's text as a draft", async () => {
    const { visitor } = await signUpWithTeam("concurrent");
    const label = await newSheet(visitor, "Two editors at once");
    expect((await save(visitor, label, SOURCE, null)).status).toBe(302);
    const base = await latestRevisionId(label, "Team concurrent");
    // Two editors opened revision A; the first saves B.
    expect((await save(visitor, label, SOURCE.replace("30 deg", "25 deg"), base)).status).toBe(302);
    const stale = await save(visitor, label, SOURCE.replace("30 deg", "36 deg"), base, "my change");
    expect(stale.status).toBe(409);
    expect(await stale.text()).toContain("Revision B was saved after you opened this sheet");
    const revisions = await serverQuery<{ label: string }>(
      `select r.label from sheet_revision r join calc_sheet s on s.id = r.sheet_id join organization o on o.id = s.team_id where o.name = 'Team concurrent' order by r.sequence`,
    );
    expect(revisions.map((r) => r.label)).toEqual(["A", "B"]);
    const editor = await (await visitor.get(`/sheets/${label}/edit`)).text();
    expect(editor).toContain("Restored your unsaved draft");
    expect(editor).toContain("36 deg");
  });

  it("lets a viewer read sheets but refuses their save, their new sheet and their project with 403", async () => {
    const engineer = await new Visitor().signIn("engineer@example.com");
    const label = await newSheet(engineer, "Readable by viewers");
    expect((await save(engineer, label, SOURCE, null)).status).toBe(302);
    const viewer = await new Visitor().signIn("viewer@example.com");
    expect((await viewer.get(`/sheets/${label}`)).status).toBe(200);
    expect(await (await viewer.get(`/sheets/${label}`)).text()).not.toContain("Edit — new revision");
    expect((await viewer.postForm(`/sheets/${label}/edit`, { intent: "save", source: SOURCE, baseRevisionId: "" })).status).toBe(403);
    expect((await viewer.get(`/sheets/${label}/edit`)).status).toBe(403);
    expect((await viewer.postForm("/sheets/new", { title: "Not allowed" })).status).toBe(403);
    expect((await viewer.postForm("/projects", { code: "NOPE", name: "Not allowed" })).status).toBe(403);
  });

  it("keeps one team's sheets invisible to another team", async () => {
    const engineer = await new Visitor().signIn("engineer@example.com");
    const label = await newSheet(engineer, "Larkfield only");
    const outsider = await signUpWithTeam("nosy");
    expect((await outsider.visitor.get(`/sheets/${label}`)).status).toBe(404);
    expect((await outsider.visitor.postForm(`/sheets/${label}/edit`, { intent: "save", source: SOURCE, baseRevisionId: "" })).status).toBe(404);
    const list = await (await outsider.visitor.get("/sheets")).text();
    expect(list).not.toContain("Larkfield only");
  });

  it("creates, lists and edits projects with a clear message for a duplicate code", async () => {
    const { visitor } = await signUpWithTeam("projects");
    const created = await visitor.postForm("/projects", { code: "gpu-400", name: "400 Hz ground power unit", client: "Airfield services", description: "" });
    expect(created.status).toBe(302);
    expect(created.headers.get("location")).toBe("/projects/GPU-400");
    const again = await visitor.postForm("/projects", { code: "GPU-400", name: "Another", client: "", description: "" });
    expect(again.status).toBe(400);
    expect(await again.text()).toContain("already used by another project");
    const bad = await visitor.postForm("/projects", { code: "no spaces!", name: "x", client: "", description: "" });
    expect(bad.status).toBe(400);
    expect(await bad.text()).toContain("Use 2–24 letters, digits or hyphens");
    expect(await (await visitor.get("/projects/GPU-400")).text()).toContain("400 Hz ground power unit");
  });
});

describe("calc sheets: untrusted source", () => {
  const ATTACKS: [string, string][] = [
    ["ESM import", `import x from "y"\n\n# Hi`],
    ["ESM export", `export const a = 1\n\n# Hi`],
    ["expression", `# Hi\n\n{alert(1)}`],
    ["script element", `<script>alert(1)</script>`],
    ["iframe element", `<iframe src="https://example.org"></iframe>`],
    ["object element", `<object data="x.swf"></object>`],
    ["style element", `<style>{"body{display:none}"}</style>`],
    ["onerror attribute", `<img src="x" onerror="alert(1)" />`],
    ["javascript: link", `[click](javascript:alert(1))`],
    ["expression attribute", `<QuasiSquare id="qs1" vdc={48} />`],
    ["spread attribute", `<QuasiSquare {...props} />`],
    ["unknown component", `<Exploit id="x" />`],
  ];

  for (const [name, source] of ATTACKS) {
    it(`refuses ${name} with a message naming line and column, storing nothing`, async () => {
      const { visitor } = await signUpWithTeam(`attack-${name.replace(/\W+/g, "-")}`);
      const label = await newSheet(visitor, `Attack: ${name}`);
      const response = await save(visitor, label, source, null);
      expect(response.status).toBe(400);
      const html = await response.text();
      expect(html).toContain("Problems in the source");
      expect(html).toMatch(/line \d+, column \d+/);
      const stored = await serverQuery(`select 1 from sheet_revision r join calc_sheet s on s.id = r.sheet_id where s.title = $1`, [`Attack: ${name}`]);
      expect(stored).toHaveLength(0);
    });
  }

  it("refuses a 5 MB source and 10,000 nested elements with a clear message", async () => {
    const { visitor } = await signUpWithTeam("attack-size");
    const label = await newSheet(visitor, "Attack: size");
    const huge = await save(visitor, label, "x".repeat(5 * 1024 * 1024), null);
    expect([400, 413]).toContain(huge.status);
    const nested = await save(visitor, label, "<span>".repeat(10_000) + "deep" + "</span>".repeat(10_000), null);
    expect(nested.status).toBe(400);
    expect(await nested.text()).toMatch(/nest/i);
    const stored = await serverQuery(`select 1 from sheet_revision r join calc_sheet s on s.id = r.sheet_id where s.title = 'Attack: size'`);
    expect(stored).toHaveLength(0);
  });
});
