import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { evaluateSheet } from "../../app/lib/calc/evaluate-sheet";
import type { ScalarResult } from "../../app/lib/calc/types";
import { describeViolations, openBrowser, seriousAccessibilityViolations, signInThroughPage, type BrowserSession } from "../support/browser";
import { BASE_URL } from "../support/http";
import { serverQuery } from "../support/server-db";

let session: BrowserSession;
beforeAll(async () => {
  session = await openBrowser();
});
afterAll(async () => {
  await session?.close();
});

/** What the engine says, as the page should display it. */
function expected(alpha: string) {
  const evaluation = evaluateSheet([
    { id: "qs1", calculator: "quasi-square", inputs: { vdc: "48 V", alpha, f: "50 Hz", hmax: "49" } },
    { id: "lc1", calculator: "lc-filter", inputs: { l: "1 mH", c: "10 uF", fsw: "20 kHz", f: "50 Hz", vout: "=qs1.v1Rms" } },
  ]);
  const qs = evaluation.blocks.qs1!;
  const lc = evaluation.blocks.lc1!;
  if (!qs.ok || !lc.ok) throw new Error("engine failed on the test inputs");
  return { thd: (qs.results.thd as ScalarResult).display, icRms: (lc.results.icRms as ScalarResult).display };
}

describe("writing a calc sheet in the browser", () => {
  it("creates a project and a sheet, computes live, saves, and shows the same server-computed values after a reload", async () => {
    const { page } = session;
    await signInThroughPage(page, "engineer@example.com");
    const code = `E2E-${Date.now().toString(36).slice(-5).toUpperCase()}`;

    await page.goto(`${BASE_URL}/projects`);
    await page.getByLabel("Code").fill(code);
    await page.getByLabel("Name").fill("Browser test inverter");
    await page.getByRole("button", { name: "Create the project" }).click();
    await page.waitForURL(`**/projects/${code}`);

    await page.getByRole("link", { name: "New sheet in this project" }).click();
    await page.getByLabel("Title").fill("Quasi-square output and its filter");
    await page.getByRole("button", { name: "Create and start writing" }).click();
    await page.waitForURL(/\/sheets\/CS-\d{4}\/edit$/);
    const label = new URL(page.url()).pathname.split("/")[2]!;

    // Replace the starter text with a heading, then insert two calculators from the palette.
    const editor = page.locator(".cm-content");
    await editor.click();
    await page.keyboard.press("Control+a");
    await page.keyboard.type("## Output stage\n");
    await page.getByRole("button", { name: /Quasi-square wave/ }).click();
    await page.getByRole("button", { name: /LC output filter/ }).click();

    const qs1 = page.locator('section[data-block-id="qs1"]');
    const lc1 = page.locator('section[data-block-id="lc1"]');
    await qs1.getByLabel(/Zero interval/).fill("20 deg");
    await qs1.getByLabel(/DC-link voltage/).fill("48 V");
    await lc1.getByLabel(/Inductance/).fill("1 mH");
    await lc1.getByLabel(/Capacitance/).fill("10 uF");
    await lc1.getByLabel(/Switching frequency/).fill("20 kHz");
    await lc1.getByLabel(/Output voltage/).fill("=qs1.v1Rms");

    const at20 = expected("20 deg");
    await expect.poll(() => qs1.textContent()).toContain(at20.thd);
    await expect.poll(() => lc1.textContent()).toContain(at20.icRms);

    // Changing alpha recomputes THD and, through the reference, the capacitor current.
    await qs1.getByLabel(/Zero interval/).fill("30 deg");
    const at30 = expected("30 deg");
    expect(at30.thd).not.toBe(at20.thd);
    await expect.poll(() => qs1.textContent()).toContain(at30.thd);
    await expect.poll(() => lc1.textContent()).toContain(at30.icRms);
    // The edited value is written back into the MDX source.
    await expect.poll(() => editor.textContent()).toContain('alpha="30 deg"');

    const violations = await seriousAccessibilityViolations(page);
    expect(violations, describeViolations(violations)).toEqual([]);

    await page.getByLabel("What changed (revision note)").fill("first issue");
    await page.getByRole("button", { name: "Save revision A" }).click();
    await page.waitForURL(`**/sheets/${label}`);
    await page.reload();
    const saved = page.locator('section[data-block-id="qs1"]');
    await expect.poll(() => saved.textContent()).toContain(at30.thd);
    expect(await page.locator('section[data-block-id="lc1"]').textContent()).toContain(at30.icRms);
    expect(await page.getByText("Revision history").count()).toBe(1);

    const rows = await serverQuery<{ block_id: string; results: Record<string, ScalarResult> }>(
      `select b.block_id, b.results from revision_block b join calc_sheet s on s.id = b.sheet_id join organization o on o.id = s.team_id
        where o.name = 'Larkfield Power Systems' and s.number = $1 order by b.position`,
      [Number(label.slice(3))],
    );
    expect(rows.map((r) => r.block_id)).toEqual(["qs1", "lc1"]);
    expect(rows[0]!.results.thd!.display).toBe(at30.thd);
    expect(rows[1]!.results.icRms!.display).toBe(at30.icRms);
    expect(session.pageErrors).toEqual([]);
  });
});
