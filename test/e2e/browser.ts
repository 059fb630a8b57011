/**
 * Shared browser-test helpers: Debian's chromium through playwright-core, outside hosts
 * blocked and recorded, axe-core, and the per-page checks every built page must pass.
 */
import { existsSync, readFileSync } from "node:fs";
import { resolve } from "node:path";
import { expect } from "vitest";
import { chromium, type BrowserContext, type Page } from "playwright-core";

export const CHROMIUM = "/usr/bin/chromium";
export const HAVE_CHROMIUM = existsSync(CHROMIUM);
export const ARTIFACTS = resolve("test-artifacts");
const AXE_SOURCE_PATH = resolve("node_modules/axe-core/axe.min.js");

/** Launches chromium with a fresh profile; every request to a host other than 127.0.0.1 is aborted and recorded. */
export async function launchBrowser(profileDir: string, outsideRequests: string[], javaScriptEnabled = true): Promise<BrowserContext> {
  const context = await chromium.launchPersistentContext(profileDir, {
    javaScriptEnabled,
    executablePath: CHROMIUM,
    headless: true,
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
    viewport: { width: 1280, height: 900 },
  });
  await context.route("**/*", (route) => {
    const url = new URL(route.request().url());
    if (url.protocol === "data:" || url.hostname === "127.0.0.1") return route.continue();
    outsideRequests.push(url.href);
    return route.abort();
  });
  return context;
}

export interface AxeResult {
  violations: { id: string; impact: string; nodes: { target: string[] }[] }[];
}

/** Runs axe-core on the page's document and returns its violations. */
export async function runAxe(page: Page): Promise<AxeResult> {
  // Evaluated through the DevTools protocol: the pages' Content-Security-Policy forbids inline
  // scripts (and eval), which addScriptTag would need.
  await page.evaluate(readFileSync(AXE_SOURCE_PATH, "utf8"));
  return page.evaluate(async () => {
    const r = await (window as unknown as { axe: { run: (d: Document) => Promise<AxeResult> } }).axe.run(document);
    return { violations: r.violations.map((v) => ({ id: v.id, impact: v.impact, nodes: v.nodes.map((n) => ({ target: n.target })) })) };
  });
}

/** Opens a URL, collecting console errors, page errors and dialogs (a dialog means injected script ran). */
export async function openPage(context: BrowserContext, url: string, dialogs: string[]): Promise<{ page: Page; errors: string[] }> {
  const page = await context.newPage();
  const errors: string[] = [];
  page.on("console", (m) => {
    if (m.type() === "error") errors.push(m.text());
  });
  page.on("pageerror", (e) => errors.push(String(e)));
  page.on("dialog", (d) => {
    dialogs.push(d.message());
    void d.dismiss();
  });
  const response = await page.goto(url, { waitUntil: "networkidle" });
  expect(response?.status(), url).toBe(200);
  return { page, errors };
}

/** Every chart figure must have swapped its SVG fallback for a live vega view with drawn data marks. */
export async function expectChartsLive(page: Page): Promise<number> {
  const charts = await page.locator("figure[data-chart]").count();
  if (charts === 0) return 0;
  await page.waitForFunction(
    () => Array.from(document.querySelectorAll("figure[data-chart]")).every((f) => (f as HTMLElement).dataset.chartState),
    undefined,
    { timeout: 30_000 },
  );
  const states = await page.$$eval("figure[data-chart]", (fs) => {
    type Node = { marktype?: string; role?: string; items?: Node[] };
    // Data-mark items in a vega scenegraph (what a canvas view drew).
    const countMarks = (n: Node | undefined): number =>
      !n ? 0 : (n.role === "mark" && n.marktype !== "group" ? (n.items?.length ?? 0) : 0) + (n.items ?? []).reduce((s, c) => s + countMarks(c), 0);
    return fs.map((f) => {
      const view = (f as unknown as { vegaView?: { data: unknown; scenegraph: () => { root: Node } } }).vegaView;
      const canvas = f.querySelector(".chart-live canvas") !== null;
      return {
        state: (f as HTMLElement).dataset.chartState,
        hasView: typeof view?.data === "function",
        liveSvg: f.querySelector(".chart-live svg, .chart-live canvas") !== null,
        // SVG views: drawn data-mark paths; canvas views (the heatmap): items in the scenegraph.
        marks: canvas ? countMarks(view?.scenegraph().root) : f.querySelectorAll(".chart-live g.role-mark path").length,
      };
    });
  });
  for (const s of states) expect(s).toMatchObject({ state: "interactive", hasView: true, liveSvg: true });
  expect(states.every((s) => s.marks > 0)).toBe(true);
  return charts;
}

/** Every same-origin link stays under `prefix` and answers 200. */
export async function expectLinksResolve(page: Page, origin: string, prefix: string): Promise<void> {
  const hrefs = await page.$$eval('a[href], link[href]:not([rel="canonical"])', (as) => as.map((a) => (a as HTMLAnchorElement).href));
  for (const href of hrefs) {
    const url = new URL(href);
    if (url.origin !== origin) continue;
    expect(url.pathname.startsWith(prefix), href).toBe(true);
    const r = await fetch(`${url.origin}${url.pathname}`);
    expect(r.status, href).toBe(200);
  }
}

/**
 * Opens `url` at `width` px and waits until every chart is live (or stayed static) and has
 * re-laid out: charts size themselves to their box.
 */
export async function openAtWidth(context: BrowserContext, url: string, dialogs: string[], width: number): Promise<{ page: Page; errors: string[] }> {
  const opened = await openPage(context, url, dialogs);
  await opened.page.setViewportSize({ width, height: 900 });
  await opened.page.waitForFunction(() => [...document.querySelectorAll("figure[data-chart]")].every((f) => (f as HTMLElement).dataset.chartState), undefined, { timeout: 30_000 });
  await opened.page.waitForTimeout(300);
  return opened;
}
