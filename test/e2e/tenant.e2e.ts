/**
 * The tenant site (`build --audience tenants`, issue 15) of the demo portfolio in chromium at a
 * phone (390 px) and a desktop (1440 px) width: every page loads without console errors, its
 * charts go live, nothing scrolls sideways, axe-core finds no violations, and the tenant page
 * reads as designed — one section per commodity the building has, the caution, the contact line
 * from portfolio.yaml, a chart with the weather expectation, and no "−0 %".
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { existsSync } from "node:fs";
import { mkdir, mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import type { BrowserContext, Page } from "playwright-core";
import { buildPortfolioSite } from "../../src/pipeline/build.ts";
import { serveStatic, type RunningServer } from "./staticServer.ts";
import { ARTIFACTS, HAVE_CHROMIUM, expectChartsLive, expectLinksResolve, launchBrowser, openPage, runAxe } from "./browser.ts";

const DEMO = resolve("data/demo");
const PREFIX = "/tenants/";
/** The demo's tenant pages (buildings.csv tenant_page = yes); only ashelm has a contact (portfolio.yaml contacts). */
const PAGES = ["index.html", "buildings/ashelm/tenant.html", "buildings/willow-clinic/tenant.html"];

describe.skipIf(!HAVE_CHROMIUM || !existsSync(DEMO))("the tenant site in chromium at 390 and 1440 px", () => {
  let work = "";
  let server: RunningServer;
  let context: BrowserContext;
  const outsideRequests: string[] = [];
  const dialogs: string[] = [];

  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-tenant-e2e-"));
    const site = join(work, "site");
    await buildPortfolioSite({ dir: "data/demo", outDir: site, strict: false, audience: "tenants", buildDate: "2026-01-15" });
    server = await serveStatic(site, PREFIX);
    context = await launchBrowser(join(work, "profile"), outsideRequests);
  }, 240_000);

  afterAll(async () => {
    await context?.close();
    await server?.close();
    if (work) await rm(work, { recursive: true, force: true });
  });

  async function openAt(path: string, width: number): Promise<{ page: Page; errors: string[] }> {
    const opened = await openPage(context, `${server.origin}${PREFIX}${path}`, dialogs);
    await opened.page.setViewportSize({ width, height: 900 });
    await opened.page.waitForFunction(() => [...document.querySelectorAll("figure[data-chart]")].every((f) => (f as HTMLElement).dataset.chartState), undefined, { timeout: 30_000 });
    await opened.page.waitForTimeout(300);
    return opened;
  }

  for (const width of [390, 1440]) {
    it(`at ${width} px: loads cleanly, charts live, links resolve, no sideways scrolling, no axe violations`, async () => {
      for (const path of PAGES) {
        const { page, errors } = await openAt(path, width);
        const charts = await expectChartsLive(page);
        if (path.endsWith("tenant.html")) expect(charts, path).toBeGreaterThan(0);
        await expectLinksResolve(page, server.origin, PREFIX);
        const [scrollWidth, innerWidth] = await page.evaluate(() => [document.documentElement.scrollWidth, window.innerWidth]);
        expect(scrollWidth, `${path} at ${width} px`).toBeLessThanOrEqual(innerWidth);
        const axe = await runAxe(page);
        expect(axe.violations, `${path} at ${width} px: ${JSON.stringify(axe.violations)}`).toEqual([]);
        if (path === PAGES[1]) {
          await mkdir(ARTIFACTS, { recursive: true });
          await page.screenshot({ path: join(ARTIFACTS, `tenant-site-ashelm-${width}.png`), fullPage: true });
        }
        expect(errors, path).toEqual([]);
        await page.close();
      }
      expect(outsideRequests).toEqual([]);
      expect(dialogs).toEqual([]);
    }, 240_000);
  }

  it("the tenant page: one section per commodity, the caution, the contact, the expectation line, no −0 %", async () => {
    const { page, errors } = await openAt(PAGES[1], 1440);
    // ashelm has electricity, gas and water meters (data/demo/meters.csv).
    expect(await page.locator("main h2").allInnerTexts()).toEqual(["Electricity", "Gas", "Water", "Questions about this page", "How these figures are made"]);
    expect(await page.locator("h1").innerText()).toContain("electricity, gas and water use");
    expect(await page.locator("#tenant-caution").innerText()).toMatch(/meter readings and local weather records\. Expected figures are estimates/);
    expect(await page.locator(".tenant-contact p").innerText()).toBe("Resident services, ground-floor office: 555-0148, residents@ashelm.example");
    const text = await page.locator("main").innerText();
    expect(text).not.toMatch(/−0 %|-0 %|\+0 %/);
    expect(text).not.toMatch(/more per day than|allowing for the weather/i);
    expect(text).toMatch(/Latest bill: .* days\. The building used/);
    // Each chart has an accessible name and a table of the same numbers.
    for (const fig of await page.locator("figure[data-chart]").all()) {
      expect(await fig.locator("svg").first().getAttribute("aria-label")).toMatch(/use per day in .* for each calendar month/);
      expect(await fig.locator("details table tbody tr").count()).toBeGreaterThanOrEqual(12);
    }
    expect(errors).toEqual([]);
    await page.close();
    // willow-clinic has no contact line: no contact section.
    const other = await openAt(PAGES[2], 390);
    expect(await other.page.locator(".tenant-contact").count()).toBe(0);
    await other.page.close();
  }, 120_000);
});
