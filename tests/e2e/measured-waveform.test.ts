import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { describeViolations, openBrowser, seriousAccessibilityViolations, signInThroughPage, type BrowserSession } from "../support/browser";
import { captureCsv, quasiSquare } from "../support/capture-synth";
import { BASE_URL } from "../support/http";
import { serverQuery } from "../support/server-db";

let session: BrowserSession;
beforeAll(async () => {
  session = await openBrowser();
});
afterAll(async () => {
  await session?.close();
});

// An invented bench capture: a 48 V quasi-square output at α = 30°, with probe noise.
const capture = captureCsv({
  sampleRate: 50_000,
  samples: 10_000,
  seed: 77,
  preamble: ["Invented bench export"],
  channels: [{ name: "Vout", unit: "V", valueAt: quasiSquare(48, (30 * Math.PI) / 180, 50, 0.4), noise: 0.2 }],
});

describe("measuring a capture in the browser", () => {
  it("uploads a CSV on a sheet, measures it against a calculator, and shows the comparison and the plots", async () => {
    const { page } = session;
    await signInThroughPage(page, "engineer@example.com");
    await page.goto(`${BASE_URL}/sheets/new`);
    await page.getByLabel("Title").fill("Bench capture of the quasi-square output");
    await page.getByRole("button", { name: "Create and start writing" }).click();
    await page.waitForURL(/\/sheets\/CS-\d{4}\/edit$/);
    const label = new URL(page.url()).pathname.split("/")[2]!;

    await page.getByLabel("Attach a file").setInputFiles({ name: "bench-30deg.csv", mimeType: "text/csv", buffer: Buffer.from(capture) });
    await expect.poll(() => page.getByRole("status").filter({ hasText: "is attached" }).count(), { timeout: 20_000 }).toBe(1);
    // The list shows the capture with its analysed channel and a download link.
    await expect.poll(() => page.getByRole("link", { name: "bench-30deg.csv" }).count()).toBeGreaterThan(0);

    const editor = page.locator(".cm-content");
    await editor.click();
    await page.keyboard.press("Control+a");
    await page.keyboard.type("## Bench\n");
    await page.getByRole("button", { name: /Quasi-square wave/ }).click();
    const qs1 = page.locator('section[data-block-id="qs1"]');
    await qs1.getByLabel(/Zero interval/).fill("30 deg");
    await qs1.getByLabel(/DC-link voltage/).fill("48 V");
    await page.getByRole("button", { name: /bench-30deg\.csv/ }).click();

    const measured = page.locator('section[data-block-id="m1"]');
    await expect.poll(() => measured.textContent(), { timeout: 20_000 }).toContain("Matches qs1 within tolerance");
    const table = measured.getByRole("region", { name: "Comparison of m1 with qs1" });
    expect(await table.getByRole("row").count()).toBe(6); // head, fundamental, THD, 3rd, 5th, 7th
    expect(await table.textContent()).toContain("within");
    expect(await measured.locator("figure").count()).toBe(2); // waveform and spectrum
    expect(await measured.locator("figure .sw-chart svg").count()).toBe(2);
    expect(await measured.textContent()).toContain("Probing lethal voltages.");

    const violations = await seriousAccessibilityViolations(page);
    expect(violations, describeViolations(violations)).toEqual([]);

    await page.getByLabel("What changed (revision note)").fill("bench capture measured");
    await page.getByRole("button", { name: "Save revision A" }).click();
    await page.waitForURL(`**/sheets/${label}`);
    const saved = page.locator('section[data-block-id="m1"]');
    await expect.poll(() => saved.textContent()).toContain("Matches qs1 within tolerance");
    expect(await saved.getByRole("region", { name: "Comparison of m1 with qs1" }).getByRole("row").count()).toBe(6);
    expect(await saved.locator("figure .sw-chart svg").count()).toBe(2);
    const onSheet = await seriousAccessibilityViolations(page);
    expect(onSheet, describeViolations(onSheet)).toEqual([]);

    const [revision] = await serverQuery<{ measurements: { m1: { comparison: { pass: boolean } } } }>(
      `select r.measurements from sheet_revision r join calc_sheet s on s.id = r.sheet_id join organization o on o.id = s.team_id
        where o.name = 'Larkfield Power Systems' and s.number = $1`,
      [Number(label.slice(3))],
    );
    expect(revision!.measurements.m1.comparison.pass).toBe(true);
    expect(session.pageErrors).toEqual([]);
  });
});
