/**
 * Pages that only read ship no engine and no chart library: read from the built app (the
 * route manifest and the chunk contents vite.config.ts records), and checked in the browser
 * against what a sheet page really fetches. The editors load the engine and the MDX
 * pipeline lazily, after the page is up.
 */
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openBrowser, signInThroughPage, type BrowserSession } from "../support/browser";
import { engineAndChartCode, firstLoadFiles, lazyFiles, modulesIn, pageRoutes, readClientBuild } from "../support/client-build";
import { BASE_URL } from "../support/http";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
const build = readClientBuild(root);
const EDITORS = ["routes/sheets.$number.edit", "routes/documents.$number.edit"];
const readingRoutes = pageRoutes(build).filter((route) => !EDITORS.includes(route.id));

describe("the built app", () => {
  it("has the reading routes this test is about", () => {
    expect(readingRoutes.map((r) => r.id)).toEqual(expect.arrayContaining(["sheet", "sheet-revision", "document", "routes/projects.$code", "routes/search", "routes/desk", "routes/sheets.$number.diff"]));
    // The sheet page's own module is in its first load, so the graph is read right.
    expect(modulesIn(build, firstLoadFiles(build, "sheet"))).toContain("app/routes/sheets.$number.tsx");
  });

  it.each(readingRoutes.map((r) => [r.id]))("%s loads no chart library, units engine, MDX pipeline, KaTeX or calculator code", (routeId) => {
    const found = engineAndChartCode(modulesIn(build, firstLoadFiles(build, routeId)));
    expect(found, found.map((f) => `${f.name} (${f.example})`).join("; ")).toEqual([]);
  });

  it.each(EDITORS.map((id) => [id]))("%s loads the engine and the MDX pipeline only by dynamic import", (routeId) => {
    const first = firstLoadFiles(build, routeId);
    expect(engineAndChartCode(modulesIn(build, first))).toEqual([]);
    const later = engineAndChartCode(modulesIn(build, lazyFiles(build, first))).map((f) => f.name);
    expect(later).toEqual(expect.arrayContaining(["mathjs", "@mdx-js", "unified/remark/rehype", "katex", "calculator compute code"]));
  });
});

describe("a sheet page in the browser", () => {
  let session: BrowserSession;
  beforeAll(async () => {
    session = await openBrowser();
  });
  afterAll(async () => {
    await session?.close();
  });

  it("fetches only the scripts of its first load, and draws its charts", async () => {
    const { page, pageErrors } = session;
    await signInThroughPage(page, "viewer@example.com");
    const scripts: string[] = [];
    page.on("request", (request) => {
      const url = new URL(request.url());
      if (url.pathname.startsWith("/assets/") && url.pathname.endsWith(".js")) scripts.push(url.pathname.slice(1));
    });
    // CS-0001: an SPWM block, with its waveform and spectrum.
    await page.goto(`${BASE_URL}/sheets/CS-0001`);
    await page.waitForLoadState("networkidle");
    expect(await page.locator("figure .sw-chart svg").count()).toBeGreaterThanOrEqual(2);
    const allowed = new Set(firstLoadFiles(build, "sheet"));
    expect(scripts.length).toBeGreaterThan(0);
    expect(scripts.filter((s) => !allowed.has(s))).toEqual([]);
    expect(engineAndChartCode(modulesIn(build, scripts))).toEqual([]);
    expect(pageErrors).toEqual([]);
  });
});
