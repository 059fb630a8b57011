/**
 * The built site in a real browser (Debian's chromium through playwright-core), served from a
 * sub-path: every page loads without console errors, charts become interactive vega views
 * under the pages' own Content-Security-Policy (no 'unsafe-eval'),
 * table sorting works, links resolve under the sub-path, axe-core finds no violations, and no
 * request leaves 127.0.0.1. Screenshots go to test-artifacts/.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { existsSync, readFileSync } from "node:fs";
import { mkdir, mkdtemp, readdir, readFile, rm, writeFile } from "node:fs/promises";
import { gzipSync } from "node:zlib";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { writeSite } from "../../src/site/writeSite.ts";
import { EVIL_NAME, fixtureInput } from "../report/fixture.ts";
import { serveStatic, type RunningServer } from "./staticServer.ts";

const CHROMIUM = "/usr/bin/chromium";
const HAVE_CHROMIUM = existsSync(CHROMIUM);
const PREFIX = "/reports/";
const ARTIFACTS = resolve("test-artifacts");
const AXE = resolve("node_modules/axe-core/axe.min.js");
const PAGES = ["index.html", "methods.html", "data.html", "buildings/B1.html", "buildings/B2.html"];

if (!HAVE_CHROMIUM) {
  console.warn(`e2e skipped: ${CHROMIUM} not found (install Debian's chromium: apt-get install -y chromium)`);
}

interface AxeResult {
  violations: { id: string; impact: string; nodes: { target: string[] }[] }[];
}

async function runAxe(page: Page): Promise<AxeResult> {
  // Evaluated through the DevTools protocol: the pages' Content-Security-Policy forbids inline
  // scripts (and eval), which addScriptTag would need.
  await page.evaluate(readFileSync(AXE, "utf8"));
  return page.evaluate(async () => {
    const r = await (window as unknown as { axe: { run: (d: Document) => Promise<AxeResult> } }).axe.run(document);
    return { violations: r.violations.map((v) => ({ id: v.id, impact: v.impact, nodes: v.nodes.map((n) => ({ target: n.target })) })) };
  });
}

describe.skipIf(!HAVE_CHROMIUM)("the built site in chromium, served under /reports/", () => {
  let work: string;
  let site: string;
  let buildMs = 0;
  let server: RunningServer;
  let context: BrowserContext;
  const outsideRequests: string[] = [];
  const dialogs: string[] = [];

  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-e2e-"));
    site = join(work, "site");
    const t0 = performance.now();
    await writeSite(buildSiteModel(fixtureInput()), { "findings.csv": "building_id\nB1\n", "portfolio.json": "[]\n" }, site);
    buildMs = Math.round(performance.now() - t0);
    server = await serveStatic(site, PREFIX);
    await mkdir(ARTIFACTS, { recursive: true });
    context = await chromium.launchPersistentContext(join(work, "profile"), {
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
    // Block, and record, anything not addressed to our own server.
    await context.route("**/*", (route) => {
      const url = new URL(route.request().url());
      if (url.protocol === "data:" || url.hostname === "127.0.0.1") return route.continue();
      outsideRequests.push(url.href);
      return route.abort();
    });
  });

  afterAll(async () => {
    await context?.close();
    await server?.close();
    if (work) await rm(work, { recursive: true, force: true });
  });

  async function open(path: string): Promise<{ page: Page; errors: string[] }> {
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
    const response = await page.goto(`${server.origin}${PREFIX}${path}`, { waitUntil: "networkidle" });
    expect(response?.status(), path).toBe(200);
    return { page, errors };
  }

  it("axe-core can fail: an image without alt text is a violation (proves the zero below means something)", async () => {
    const page = await context.newPage();
    await page.setContent('<!doctype html><html lang="en"><head><title>t</title></head><body><main><h1>t</h1><img src="data:,"></main></body></html>');
    const result = await runAxe(page);
    expect(result.violations.map((v) => v.id)).toContain("image-alt");
    await page.close();
  });

  for (const path of PAGES) {
    it(`${path}: loads cleanly, charts interactive, links resolve, no axe violations`, async () => {
      const { page, errors } = await open(path);
      // Charts: every figure swaps its SVG fallback for a live vega view.
      const charts = await page.locator("figure[data-chart]").count();
      if (charts > 0) {
        await page.waitForFunction(
          () => Array.from(document.querySelectorAll("figure[data-chart]")).every((f) => (f as HTMLElement).dataset.chartState),
          undefined,
          { timeout: 20_000 },
        );
        const states = await page.$$eval("figure[data-chart]", (fs) =>
          fs.map((f) => ({
            state: (f as HTMLElement).dataset.chartState,
            hasView: typeof (f as unknown as { vegaView?: { data: unknown } }).vegaView?.data === "function",
            liveSvg: f.querySelector(".chart-live svg") !== null,
            marks: f.querySelectorAll(".chart-live .mark-rect path").length,
          })),
        );
        for (const s of states) expect(s).toMatchObject({ state: "interactive", hasView: true, liveSvg: true });
        expect(states.every((s) => s.marks > 0)).toBe(true);
      }
      // Links: every same-origin link stays under the prefix and answers 200.
      const hrefs = await page.$$eval("a[href]", (as) => as.map((a) => (a as HTMLAnchorElement).href));
      for (const href of hrefs) {
        const url = new URL(href);
        if (url.origin !== server.origin) continue;
        expect(url.pathname.startsWith(PREFIX), href).toBe(true);
        const r = await fetch(`${url.origin}${url.pathname}`);
        expect(r.status, href).toBe(200);
      }
      const axe = await runAxe(page);
      expect(axe.violations, JSON.stringify(axe.violations, null, 1)).toEqual([]);
      await page.screenshot({ path: join(ARTIFACTS, `${path.replace(/\//g, "_").replace(/\.html$/, "")}.png`), fullPage: true });
      expect(errors).toEqual([]);
      await page.close();
    });
  }

  it("pages enforce their Content-Security-Policy (no inline script, no eval), so the clean consoles above mean vega ran without eval", async () => {
    const { page } = await open("buildings/B1.html");
    // Chromium logs a refused eval or inline script as a console error; the page tests above
    // found none while the charts went live. Here: the policy is really in force.
    await expect(page.addScriptTag({ content: "window.__inline = 1" })).rejects.toThrow(/Content Security Policy/);
    expect(await page.evaluate(() => (window as unknown as { __inline?: number }).__inline)).toBeUndefined();
    await page.close();
  });

  it("prints a building page as a clean report: no navigation, static charts, tables kept", async () => {
    const { page } = await open("buildings/B1.html");
    await page.waitForFunction(() => document.querySelector("figure[data-chart]")?.getAttribute("data-chart-state") === "interactive");
    await page.emulateMedia({ media: "print" });
    expect(await page.locator(".site-header nav").isVisible()).toBe(false);
    expect(await page.locator(".chart-live").first().isVisible()).toBe(false);
    expect(await page.locator(".chart-fallback svg").first().isVisible()).toBe(true);
    expect(await page.locator("table").first().isVisible()).toBe(true);
    await page.pdf({ path: join(ARTIFACTS, "buildings_B1-print.pdf"), format: "A4", printBackground: false });
    await page.emulateMedia({ media: "screen" });
    expect(await page.locator(".site-header nav").isVisible()).toBe(true);
    await page.close();
  });

  it("shows a tooltip when the pointer rests on a bar", async () => {
    const { page } = await open("buildings/B1.html");
    await page.waitForFunction(() => document.querySelector("figure[data-chart]")?.getAttribute("data-chart-state") === "interactive");
    const bar = page.locator("figure[data-chart] .chart-live .mark-rect path").first();
    await bar.hover({ force: true });
    const tooltip = page.locator("#vg-tooltip-element");
    await expect.poll(async () => (await tooltip.count()) > 0 && (await tooltip.isVisible()), { timeout: 5000 }).toBe(true);
    expect(await tooltip.textContent()).toMatch(/Month.*Meter.*Usage \(kWh\)/s);
    await page.close();
  });

  it("records the page weight of a building page (HTML + JS + CSS, raw and gzip) in test-artifacts", async () => {
    const files = [join(site, "buildings/B1.html"), ...(await readdir(join(site, "assets"))).map((f) => join(site, "assets", f))];
    const weights = await Promise.all(
      files.map(async (f) => {
        const body = await readFile(f);
        return { file: f.slice(site.length + 1), bytes: body.length, gzipBytes: gzipSync(body, { level: 9 }).length };
      }),
    );
    const total = { bytes: weights.reduce((s, w) => s + w.bytes, 0), gzipBytes: weights.reduce((s, w) => s + w.gzipBytes, 0) };
    await writeFile(join(ARTIFACTS, "page-weight.json"), JSON.stringify({ page: "buildings/B1.html", buildMs, files: weights, total }, null, 2));
    // Budget: the vega runtime dominates (about 300 kB gzip); fail loudly if a change doubles it.
    expect(total.gzipBytes).toBeLessThan(450_000);
  });

  it("sorts the building table by floor area, both directions", async () => {
    const { page } = await open("index.html");
    const areas = () =>
      page.$$eval("table[data-sortable] tbody tr", (rows) => rows.map((r) => Number((r as HTMLTableRowElement).cells[2].dataset.sort)));
    const header = page.locator("table[data-sortable] thead th").nth(2);
    await header.locator("button").click();
    expect(await header.getAttribute("aria-sort")).toBe("ascending");
    const asc = await areas();
    expect(asc).toEqual([...asc].sort((a, b) => a - b));
    await header.locator("button").click();
    expect(await header.getAttribute("aria-sort")).toBe("descending");
    const desc = await areas();
    expect(desc).toEqual([...asc].sort((a, b) => b - a));
    expect(desc).not.toEqual(asc);
    await page.close();
  });

  it("shows a building named like a script tag as text, running nothing", async () => {
    const { page } = await open("buildings/B2.html");
    expect(await page.locator("h1").textContent()).toBe(EVIL_NAME);
    expect(dialogs).toEqual([]);
    await page.close();
  });

  it("asked no host other than 127.0.0.1", () => {
    expect(outsideRequests).toEqual([]);
    expect(server.requests.every((p) => p.startsWith(PREFIX))).toBe(true);
  });
});
