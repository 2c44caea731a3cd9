import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, signInThroughPage, type BrowserSession } from "../support/browser";
import { BASE_URL } from "../support/http";

let session: BrowserSession;
beforeAll(async () => {
  session = await openBrowser();
});
afterAll(async () => {
  await session?.close();
});

describe("reading sheets and documents in the browser", () => {
  it("loads a sheet page under the page's policy, answers the keyboard, and moves between pages without reloading", async () => {
    const { page, pageErrors } = session;
    await signInThroughPage(page, "viewer@example.com");
    const first = await page.goto(`${BASE_URL}/sheets/CS-0001`);
    expect(first?.status()).toBe(200);
    await expect.poll(() => page.evaluate(() => document.querySelectorAll("svg").length)).toBeGreaterThan(0);

    // Hydrated: the app's "/" shortcut takes the reader to search.
    await page.locator("main").click({ position: { x: 5, y: 5 } });
    await page.keyboard.press("/");
    await page.waitForURL((url) => url.pathname === "/search");
    await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe("search-box");

    // Client-side navigations (data requests) to a sheet and to a document: the page is replaced, not reloaded.
    const dataRequests: string[] = [];
    page.on("response", (response) => {
      if (new URL(response.url()).pathname.endsWith(".data")) dataRequests.push(`${response.status()} ${response.headers()["content-type"]}`);
    });
    await page.goto(`${BASE_URL}/sheets`);
    await page.evaluate(() => ((window as unknown as { notReloaded: boolean }).notReloaded = true));
    await page.locator('a[href="/sheets/CS-0002"]:visible').first().click();
    await page.waitForURL((url) => url.pathname === "/sheets/CS-0002");
    await expect.poll(() => page.locator("main").textContent()).toContain("CS-0002");
    expect(await page.evaluate(() => (window as unknown as { notReloaded?: boolean }).notReloaded)).toBe(true);
    await page.goto(`${BASE_URL}/projects`);
    await page.evaluate(() => ((window as unknown as { notReloaded: boolean }).notReloaded = true));
    await page.locator('main a[href="/projects/PUMP-3K"]:visible').first().click();
    await page.waitForURL((url) => url.pathname === "/projects/PUMP-3K");
    const documentLink = page.locator('a[href^="/documents/PD-"]:visible').first();
    await documentLink.click();
    await page.waitForURL((url) => url.pathname.startsWith("/documents/PD-"));
    await expect.poll(() => page.locator("main").textContent()).toMatch(/PD-\d+/);
    expect(await page.evaluate(() => (window as unknown as { notReloaded?: boolean }).notReloaded)).toBe(true);
    expect(dataRequests.length).toBeGreaterThanOrEqual(3);
    for (const answer of dataRequests) expect(answer).toMatch(/^200 text\/x-script/);
    // A blocked inline script or a failed navigation would show as a console error here.
    expect(pageErrors).toEqual([]);
  });
});
