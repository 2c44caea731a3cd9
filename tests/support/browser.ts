import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { createRequire } from "node:module";
import { tmpdir } from "node:os";
import path from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { BASE_URL } from "./http";

const require = createRequire(import.meta.url);
const axeSource = readFileSync(require.resolve("axe-core/axe.min.js"), "utf8");

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  /** Every request the pages made to a host other than this machine. */
  foreignRequests: string[];
  /** console errors and uncaught page errors. */
  pageErrors: string[];
  close(): Promise<void>;
}

/** Debian's Chromium through playwright-core, with a fresh profile and no background traffic. */
export async function openBrowser(viewport = { width: 1280, height: 900 }): Promise<BrowserSession> {
  const profile = mkdtempSync(path.join(tmpdir(), "sinewright-chromium-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: "/usr/bin/chromium",
    headless: true,
    viewport,
    args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run"],
  });
  const foreignRequests: string[] = [];
  const pageErrors: string[] = [];
  context.on("request", (request) => {
    const url = new URL(request.url());
    if (["http:", "https:", "ws:", "wss:"].includes(url.protocol) && !["127.0.0.1", "localhost", "[::1]"].includes(url.hostname)) {
      foreignRequests.push(request.url());
    }
  });
  const page = context.pages()[0] ?? (await context.newPage());
  page.on("console", (message) => {
    if (message.type() === "error") pageErrors.push(`${message.text()} (${message.location().url})`);
  });
  page.on("pageerror", (error) => pageErrors.push(error.message));
  return {
    context,
    page,
    foreignRequests,
    pageErrors,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

export async function signInThroughPage(page: Page, email: string, password = "sinewright-demo"): Promise<void> {
  await page.goto(`${BASE_URL}/sign-in`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((url) => url.pathname !== "/sign-in");
}

export interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[] }[];
}

/** Runs axe-core in the page (through the DevTools protocol, so our CSP need not allow it). */
export async function seriousAccessibilityViolations(page: Page): Promise<AxeViolation[]> {
  await page.evaluate(axeSource);
  const result = await page.evaluate(async () => {
    // @ts-expect-error axe is injected above
    const outcome = await window.axe.run(document, { resultTypes: ["violations"] });
    return outcome.violations as AxeViolation[];
  });
  return result.filter((v) => v.impact === "serious" || v.impact === "critical");
}

export function describeViolations(violations: AxeViolation[]): string {
  return violations.map((v) => `${v.id} (${v.impact}): ${v.help} at ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`).join("\n");
}
