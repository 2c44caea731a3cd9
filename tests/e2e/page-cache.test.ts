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

describe("a sheet page sent from the page cache", () => {
  it("loads, runs its scripts under the page's policy and answers the keyboard like a freshly rendered one", async () => {
    const { page, pageErrors } = session;
    await signInThroughPage(page, "viewer@example.com");
    const first = await page.goto(`${BASE_URL}/sheets/CS-0001`);
    expect(first?.status()).toBe(200);
    const again = await page.goto(`${BASE_URL}/sheets/CS-0001`);
    expect(again?.headers()["x-page-cache"]).toBe("hit");
    expect(again?.headers()["content-encoding"]).toMatch(/^(br|gzip)$/);
    await expect.poll(() => page.evaluate(() => document.querySelectorAll("svg").length)).toBeGreaterThan(0);

    // Hydrated: the app's "/" shortcut (a script, allowed only by the policy's hashes) takes the reader to search.
    await page.locator("main").click({ position: { x: 5, y: 5 } });
    await page.keyboard.press("/");
    await page.waitForURL((url) => url.pathname === "/search");
    await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe("search-box");
    // A blocked inline script would show as a console error here.
    expect(pageErrors).toEqual([]);
  });
});
