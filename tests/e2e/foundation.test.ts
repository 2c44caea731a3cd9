import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { BASE_URL } from "../support/http";
import { describeViolations, openBrowser, seriousAccessibilityViolations, signInThroughPage, type BrowserSession } from "../support/browser";

let browser: BrowserSession;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const APP_PAGES = ["/desk", "/sheets", "/projects", "/projects/PUMP-3K", "/sheets/CS-0002", "/sheets/CS-0002/diff?from=A&to=B", "/sheets/CS-0007", "/search", "/calculators", "/team", "/settings"];

describe("the foundation in a real browser", () => {
  it("shows an accessible landing page and sign-in page, all assets from this machine", async () => {
    const { page } = browser;
    for (const path of ["/", "/sign-in", "/sign-up", "/forgot-password"]) {
      await page.goto(BASE_URL + path);
      expect(await page.locator("h1").first().textContent()).toBeTruthy();
      const violations = await seriousAccessibilityViolations(page);
      expect(violations, `${path}:\n${describeViolations(violations)}`).toEqual([]);
    }
    expect(await page.evaluate(() => document.fonts.check("16px Literata"))).toBe(true);
  });

  for (const role of ["admin", "engineer", "checker", "viewer"] as const) {
    it(`signs in as the demo ${role}, walks every page of the shell, with no request leaving this machine`, async () => {
      const session = await openBrowser();
      try {
        const { page } = session;
        await signInThroughPage(page, `${role}@example.com`);
        expect(new URL(page.url()).pathname).toBe("/sheets");
        for (const path of APP_PAGES) {
          await page.goto(BASE_URL + path);
          await page.waitForLoadState("networkidle");
          const violations = await seriousAccessibilityViolations(page);
          expect(violations, `${role} ${path}:\n${describeViolations(violations)}`).toEqual([]);
        }
        const teamPage = await page.goto(BASE_URL + "/team");
        expect(teamPage?.status()).toBe(200);
        const canManage = await page.getByRole("button", { name: "Send the invitation" }).count();
        expect(canManage).toBe(role === "admin" ? 1 : 0);
        expect(session.foreignRequests).toEqual([]);
        expect(session.pageErrors).toEqual([]);
      } finally {
        await session.close();
      }
      // Eleven pages with an axe run on each take 3–6 s a page on a shared 2-core machine, so the suite's 60 s could
      // cut a healthy walk short. The timeout only bounds a hang; how fast pages are is measured by the benchmarks.
    }, 180_000);
  }

  it("works from the keyboard: skip link, menu and sign-out", async () => {
    const session = await openBrowser();
    try {
      const { page } = session;
      await signInThroughPage(page, "engineer@example.com");
      await page.waitForLoadState("networkidle");
      await page.keyboard.press("Tab");
      expect(await page.evaluate(() => document.activeElement?.getAttribute("href"))).toBe("#main");
      await page.keyboard.press("Enter");
      expect(await page.evaluate(() => location.hash)).toBe("#main");
      await page.locator("summary", { hasText: "Account menu for Tomás Okafor" }).focus();
      await page.keyboard.press("Enter");
      const signOut = page.getByRole("button", { name: "Sign out" });
      expect(await signOut.isVisible()).toBe(true);
      await signOut.focus();
      await page.keyboard.press("Enter");
      await page.waitForURL((url) => url.pathname === "/sign-in");
    } finally {
      await session.close();
    }
  });

  it("serves pages with a strict Content-Security-Policy and no inline script without the nonce", async () => {
    const response = await fetch(`${BASE_URL}/sign-in`);
    const csp = response.headers.get("content-security-policy") ?? "";
    expect(csp).toContain("script-src 'self' 'nonce-");
    expect(csp).not.toContain("unsafe-eval");
    expect(csp).toContain("frame-ancestors 'none'");
    const html = await response.text();
    const nonce = csp.match(/'nonce-([^']+)'/)![1];
    const inlineScripts = [...html.matchAll(/<script(?![^>]*\bsrc=)([^>]*)>/g)];
    expect(inlineScripts.length).toBeGreaterThan(0);
    for (const [, attrs] of inlineScripts) expect(attrs).toContain(`nonce="${nonce}"`);
    expect(response.headers.get("x-content-type-options")).toBe("nosniff");
  });
});
