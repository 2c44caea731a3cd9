// A sheet may not paint over the page that frames it. Each formula below stays inside
// the bounds the check allows (a rule of 10 em, a step back of 3 em, 6 em in all), but
// overlaps (\llap) and steps back still carry them far outside the sheet body: only the
// body's clipping keeps them off the page around it — the title block, state and stamp.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, signInThroughPage, type BrowserSession } from "../support/browser";
import { BASE_URL, teamWithRoles } from "../support/http";

const raised = (depth: number, inner: string): string => (depth === 0 ? inner : `\\raisebox{10em}{${raised(depth - 1, inner)}}`);
const COVER = "\\color{green}\\rule{10em}{10em}";
const OVERLAY_SHEET = [
  "# Overlay attempt",
  "",
  `$\\llap{${COVER}\\kern-3em${COVER}\\kern-3em${COVER}}${COVER}$`,
  "",
  `Verified: $\\kern-3em\\kern-3em\\llap{${COVER}${COVER}}$ and $${raised(5, `\\llap{${COVER}}`)}$`,
].join("\n");

let label = "";
let engineer = { email: "", password: "" };

beforeAll(async () => {
  const { people } = await teamWithRoles("overlay", ["engineer", "checker"]);
  const author = people.engineer!.visitor;
  const created = await author.postForm("/sheets/new", { title: "Overlay attempt", projectId: "", tags: "" });
  label = created.headers.get("location")!.split("/")[2]!;
  const saved = await author.postForm(`/sheets/${label}/edit`, { intent: "save", source: OVERLAY_SHEET, baseRevisionId: "", note: "" });
  if (saved.status !== 302) throw new Error(`saving the overlay sheet answered ${saved.status}: ${(await saved.text()).slice(0, 300)}`);
  await author.postForm(`/sheets/${label}`, { intent: "submit", checkerId: people.checker!.userId });
  const stamped = await people.checker!.visitor.postForm(`/sheets/${label}`, { intent: "stamp" });
  if (stamped.status !== 200) throw new Error(`stamping answered ${stamped.status}`);
  engineer = { email: people.engineer!.email, password: "correct-horse-battery" };
});

/** Points spread over an element's box that hit something other than the element itself (or what is inside it). */
async function coveredPoints(page: BrowserSession["page"], selector: string): Promise<{ points: number; covered: string[] }> {
  return page.locator(selector).first().evaluate((target) => {
    target.scrollIntoView({ block: "center" });
    const box = target.getBoundingClientRect();
    const covered: string[] = [];
    let points = 0;
    // Inset from the edges: the stamp's cut corner shows the page behind it.
    for (const fx of [0.1, 0.3, 0.5, 0.7, 0.85]) {
      for (const fy of [0.25, 0.5, 0.85]) {
        const x = box.left + box.width * fx;
        const y = box.top + box.height * fy;
        if (x < 0 || y < 0 || x >= innerWidth || y >= innerHeight) continue;
        points += 1;
        const hit = document.elementFromPoint(x, y);
        if (!hit || !target.contains(hit)) covered.push(`${Math.round(x)},${Math.round(y)}: ${hit?.tagName}.${hit?.className}`);
      }
    }
    return { points, covered };
  });
}

describe.each([1280, 390])("a sheet that tries to paint over its page, at %i px", (width) => {
  let session: BrowserSession;
  beforeAll(async () => {
    session = await openBrowser({ width, height: 900 });
    await signInThroughPage(session.page, engineer.email, engineer.password);
  });
  afterAll(async () => {
    await session?.close();
  });

  it("leaves the title block, the state and the stamp visible and unobscured", async () => {
    const { page } = session;
    await page.goto(`${BASE_URL}/sheets/${label}`);
    // The rules are laid out far to the left of the body; where they lie outside it, a point there hits the page, not them.
    const escaped = await page.locator(".prose-sheet").first().evaluate((body) => {
      body.scrollIntoView({ block: "start" });
      const edge = body.getBoundingClientRect().left;
      const rules = [...body.querySelectorAll(".katex .rule")].map((rule) => rule.getBoundingClientRect()).filter((rule) => rule.left < edge - 40);
      const paintedOutside: string[] = [];
      for (const rule of rules) {
        for (let x = Math.max(1, rule.left + 2); x < Math.min(edge - 6, rule.right); x += 15) {
          const y = rule.top + rule.height / 2;
          if (y < 0 || y >= innerHeight) continue;
          const hit = document.elementFromPoint(x, y);
          if (hit && body.contains(hit)) paintedOutside.push(`${Math.round(x)},${Math.round(y)}`);
        }
      }
      return { rules: rules.length, reach: Math.round(edge - Math.min(...rules.map((rule) => rule.left))), paintedOutside };
    });
    expect(escaped.rules).toBeGreaterThan(2);
    expect(escaped.reach).toBeGreaterThan(300);
    expect(escaped.paintedOutside).toEqual([]);

    for (const selector of ['section[aria-label="Title block"]', '[role="img"][aria-label^="Verified by"]']) {
      const { points, covered } = await coveredPoints(page, selector);
      expect(points, selector).toBeGreaterThan(0);
      expect(covered, selector).toEqual([]);
    }
    await expect.poll(() => page.locator('section[aria-label="Title block"]').getByText("verified", { exact: false }).first().isVisible()).toBe(true);
    if (process.env.SCREENSHOTS_DIR) await page.screenshot({ path: `${process.env.SCREENSHOTS_DIR}/overlay-${width}.png`, fullPage: true });
  });
});
