import { mkdirSync } from "node:fs";
import path from "node:path";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ACCESS_MATRIX, entryUrl, type Fixtures } from "../support/access-matrix";
import { describeViolations, openBrowser, seriousAccessibilityViolations, signInThroughPage, type BrowserSession } from "../support/browser";
import { BASE_URL, teamWithRoles } from "../support/http";
import { appRoutes } from "../support/route-config";
import { serverQuery } from "../support/server-db";

/**
 * Every page in app/routes.ts, at a desktop width and a phone width, as the one who sees
 * most of it (the demo admin; pages for people not signed in, anonymously): no serious or
 * critical axe-core violations, and nothing wider than the phone's screen.
 * Set SCREENSHOTS_DIR to keep a full-page screenshot of each, for looking at them.
 */
const pages = appRoutes.filter((r) => r.isPage && !r.layout);
const WIDTHS = [
  { name: "desktop", width: 1280, height: 900 },
  { name: "phone", width: 390, height: 844 },
];
const screenshots = process.env.SCREENSHOTS_DIR;

async function look(page: Page, name: string) {
  if (!screenshots) return;
  mkdirSync(screenshots, { recursive: true });
  const file = (part: string) => path.join(screenshots, `${name.replace(/[^\w.-]+/g, "_")}${part}.png`);
  await page.screenshot({ path: file(""), fullPage: true });
  // The first screens on their own, small enough to look at in full.
  const { width } = page.viewportSize()!;
  await page.screenshot({ path: file("-top"), fullPage: true, clip: { x: 0, y: 0, width, height: Math.min(1600, await page.evaluate(() => document.documentElement.scrollHeight)) } });
}

describe("accessibility of every page", () => {
  let fixtures: Fixtures;
  beforeAll(async () => {
    const { people } = await teamWithRoles("a11y-invite", []);
    const email = `a11y-invitee-${Date.now().toString(36)}@example.org`;
    await people.admin!.visitor.postForm("/team", { intent: "invite", email, role: "viewer" });
    const [row] = await serverQuery<{ id: string }>(`select id from invitation where email = $1`, [email]);
    const [attachment] = await serverQuery<{ id: string }>(`select a.id from attachment a join calc_sheet s on s.id = a.sheet_id join organization o on o.id = s.team_id where s.number = 6 and o.slug = 'larkfield-power' limit 1`);
    fixtures = { invitationId: row!.id, attachmentId: attachment?.id ?? "none" };
  });

  for (const size of WIDTHS) {
    it(`has no serious or critical violations at ${size.width} px`, async () => {
      const session = await openBrowser({ width: size.width, height: size.height });
      const problems: string[] = [];
      try {
        const { page } = session;
        // Pages for people not signed in first, then the rest as the demo admin.
        const anonymousFirst = [...pages].sort((a, b) => Number(ACCESS_MATRIX[a.id]!.get("admin") === 200) - Number(ACCESS_MATRIX[b.id]!.get("admin") === 200));
        let signedIn = false;
        for (const route of anonymousFirst) {
          const entry = ACCESS_MATRIX[route.id]!;
          const asAdmin = entry.get("admin") === 200 || entry.get("anonymous") !== 200;
          if (asAdmin && !signedIn) {
            await signInThroughPage(page, "admin@example.com");
            signedIn = true;
          }
          const url = entryUrl(entry, fixtures);
          const response = await page.goto(BASE_URL + url);
          await page.waitForLoadState("networkidle");
          expect(response!.status(), `${route.id} ${url}`).toBeLessThan(500);
          const violations = await seriousAccessibilityViolations(page);
          if (violations.length > 0) problems.push(`${route.id} ${url}:\n${describeViolations(violations)}`);
          const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
          if (overflow > 1) problems.push(`${route.id} ${url}: the page is ${overflow} px wider than the ${size.width} px window`);
          await look(page, `${size.name}-${route.id}`);
        }
        expect(problems).toEqual([]);
        // The browser logs the 404 of the page that is meant to be missing; nothing else may be logged.
        const missingPages = pages.filter((r) => ACCESS_MATRIX[r.id]!.get("admin") === 404).map((r) => entryUrl(ACCESS_MATRIX[r.id]!, fixtures));
        expect(session.pageErrors.filter((e) => !missingPages.some((url) => e.includes(`status of 404 (Not Found) (${BASE_URL}${url})`)))).toEqual([]);
      } finally {
        await session.close();
      }
    }, 240_000);
  }
});

/** What has the keyboard focus, in words a test can match: its label or text, and where it is. */
async function focused(page: Page) {
  return page.evaluate(async () => {
    // Let the page react to the focus first (the source editor marks itself focused a frame later).
    await new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(resolve)));
    const el = document.activeElement as HTMLElement | null;
    if (!el || el === document.body) return { text: "", visibleFocus: false, tag: "body", chain: "" };
    const labelled = el.getAttribute("aria-label") ?? (el as HTMLInputElement).labels?.[0]?.textContent ?? "";
    const text = `${labelled} ${el.tagName === "INPUT" || el.tagName === "TEXTAREA" ? "" : (el.textContent ?? "")}`.replace(/\s+/g, " ").trim();
    // The focus must be visible: an outline or a ring on the element or the frame drawn around it.
    let visibleFocus = false;
    const chain: string[] = [];
    for (let node: HTMLElement | null = el, depth = 0; node && depth < 3; node = node.parentElement, depth++) {
      const style = getComputedStyle(node);
      chain.push(`${node.className}: ${style.outlineStyle} ${style.outlineWidth} ${style.boxShadow}`);
      if ((style.outlineStyle !== "none" && parseFloat(style.outlineWidth) > 0) || style.boxShadow !== "none") visibleFocus = true;
    }
    return { text, visibleFocus, tag: el.tagName.toLowerCase(), chain: chain.join(" < ") };
  });
}

/** Presses Tab (or Shift+Tab) until the focused element's label or text matches; fails if it never does. */
async function tabTo(page: Page, target: RegExp, options: { backwards?: boolean; max?: number } = {}) {
  const seen: string[] = [];
  for (let i = 0; i < (options.max ?? 200); i++) {
    await page.keyboard.press(options.backwards ? "Shift+Tab" : "Tab");
    const now = await focused(page);
    if (target.test(now.text)) {
      expect(now.visibleFocus, `the focus on “${now.text.slice(0, 60)}” is not visible (${now.chain})`).toBe(true);
      return;
    }
    seen.push(now.text.slice(0, 40));
  }
  throw new Error(`Tab never reached ${target}; it went through: ${seen.join(" | ")}`);
}

/**
 * Steps the focused select's choice with the arrow keys until its chosen option matches. Not by typing the option's
 * name: a select's type-to-find forgets what was typed after a second's pause, which a loaded machine can take
 * between two keys, and then picks another person.
 */
async function chooseWithArrows(page: Page, option: RegExp) {
  const chosen = () => page.evaluate(() => (document.activeElement as HTMLSelectElement).selectedOptions[0]?.textContent?.trim() ?? "");
  await page.keyboard.press("Home");
  const seen: string[] = [];
  for (let i = 0; i < 20; i++) {
    const now = await chosen();
    if (option.test(now)) return;
    seen.push(now);
    await page.keyboard.press("ArrowDown");
  }
  throw new Error(`the select never offered ${option}; it offered: ${seen.join(" | ")}`);
}

describe("writing, submitting and checking a sheet with the keyboard alone", () => {
  let author: BrowserSession;
  let checker: BrowserSession;
  beforeAll(async () => {
    [author, checker] = await Promise.all([openBrowser(), openBrowser()]);
  });
  afterAll(async () => {
    await Promise.all([author?.close(), checker?.close()]);
  });

  async function signInByKeyboard(page: Page, email: string, password: string) {
    await page.context().clearCookies();
    await page.goto(`${BASE_URL}/sign-in`);
    await tabTo(page, /^E-mail/);
    await page.keyboard.type(email);
    await tabTo(page, /^Password/);
    await page.keyboard.type(password);
    await page.keyboard.press("Enter");
    await page.waitForURL((url) => url.pathname !== "/sign-in");
    await page.waitForLoadState("networkidle");
  }

  it("an engineer writes and submits, a checker records a check and stamps, without a mouse", async () => {
    const { people } = await teamWithRoles("keyboard", ["engineer", "checker"]);
    const password = "correct-horse-battery";
    const { page } = author;

    await signInByKeyboard(page, people.engineer!.email, password);
    await tabTo(page, /^New sheet$/);
    await page.keyboard.press("Enter");
    await page.waitForURL("**/sheets/new");
    await tabTo(page, /^Title/);
    await page.keyboard.type("Keyboard-written quasi-square output");
    await tabTo(page, /Create and start writing/);
    await page.keyboard.press("Enter");
    await page.waitForURL(/\/sheets\/CS-\d{4}\/edit$/);
    const label = new URL(page.url()).pathname.split("/")[2]!;
    await page.waitForLoadState("networkidle");

    // Into the source editor; the cursor starts at the top, so the new text goes first.
    await tabTo(page, /Sheet source \(MDX\)/);
    await page.keyboard.type('## Output by keyboard\n\n<QuasiSquare id="kb1" vdc="48 V" alpha="30 deg" />\n\n');
    const block = page.locator('section[data-block-id="kb1"]');
    await expect.poll(() => block.textContent(), { timeout: 15_000 }).toMatch(/THD/);
    await tabTo(page, /What changed/);
    await page.keyboard.type("First issue, written from the keyboard.");
    await tabTo(page, /^Save revision A$/);
    await page.keyboard.press("Enter");
    await page.waitForURL(`**/sheets/${label}`);
    await page.waitForLoadState("networkidle");

    await tabTo(page, /^Send for checking to/);
    await chooseWithArrows(page, /^Test keyboard-checker \(checker\)$/);
    await tabTo(page, /^Send for checking$/);
    await page.keyboard.press("Enter");
    await page.getByText("is sent for checking").waitFor();
    await look(page, "keyboard-submitted");

    const review = checker.page;
    await signInByKeyboard(review, people.checker!.email, password);
    await tabTo(review, /^Desk/);
    await review.keyboard.press("Enter");
    await review.waitForURL("**/desk");
    await review.waitForLoadState("networkidle");
    await tabTo(review, new RegExp(`^${label} rev A$`));
    await review.keyboard.press("Enter");
    await review.waitForURL(`**/sheets/${label}/revisions/A`);
    await review.waitForLoadState("networkidle");

    // Open the re-run form (a disclosure: Space or Enter), keep the author's inputs, run and record.
    await tabTo(review, /^Re-run kb1/);
    await review.keyboard.press("Space");
    await tabTo(review, /Agreement tolerance/);
    await tabTo(review, /^Run and record$/);
    await review.keyboard.press("Enter");
    await review.getByText("agrees with the author's results").waitFor();
    await tabTo(review, /^Verify and stamp revision A$/);
    await look(review, "keyboard-before-stamp");
    await review.keyboard.press("Enter");
    await review.getByText("is verified and stamped").waitFor();
    await look(review, "keyboard-stamped");

    const [stamps] = await serverQuery<{ n: number }>(`select count(*)::int as n from stamp where checker_id = $1`, [people.checker!.userId]);
    expect(stamps!.n).toBe(1);
    expect(author.pageErrors).toEqual([]);
    expect(checker.pageErrors).toEqual([]);
  }, 120_000);
});
