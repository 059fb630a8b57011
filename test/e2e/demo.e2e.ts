/**
 * The demo portfolio (data/demo) built by the whole pipeline and read in chromium under a
 * sub-path: every page loads without console errors, its charts go live, its links resolve,
 * axe-core finds no violations, and nothing is fetched from another host.
 */
import { afterAll, beforeAll, describe, expect, it, inject } from "vitest";
import { existsSync } from "node:fs";
import { mkdir, mkdtemp, readFile, readdir, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import type { BrowserContext } from "playwright-core";
import { serveStatic, type RunningServer } from "./staticServer.ts";
import { ARTIFACTS, HAVE_CHROMIUM, expectChartsLive, expectLinksResolve, launchBrowser, openPage, runAxe } from "./browser.ts";

const DEMO = resolve("data/demo");
const PREFIX = "/portfolio/reports/";

describe.skipIf(!HAVE_CHROMIUM || !existsSync(DEMO))("the demo site in chromium", () => {
  let work: string;
  let server: RunningServer;
  let context: BrowserContext;
  let pages: string[] = [];
  let siteDir = "";
  const outsideRequests: string[] = [];
  const dialogs: string[] = [];

  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-demo-e2e-"));
    const site = inject("demoSite");
    siteDir = site;
    // Building pages and tenant pages (buildings/<id>/tenant.html).
    const built = (await readdir(join(site, "buildings"), { recursive: true })).map((f) => f.split("\\").join("/"));
    pages = ["index.html", "buildings.html", "forecast.html", "methods.html", "data.html", ...built.filter((f) => f.endsWith(".html")).sort().map((f) => `buildings/${f}`)];
    server = await serveStatic(site, PREFIX);
    context = await launchBrowser(join(work, "profile"), outsideRequests);
  }, 180_000);

  afterAll(async () => {
    await context?.close();
    await server?.close();
    if (work) await rm(work, { recursive: true, force: true });
  });

  it("has an index, a methods page, a data page and building pages", () => {
    expect(pages.filter((p) => /^buildings\/[^/]+\.html$/.test(p)).length).toBeGreaterThanOrEqual(6);
  });

  it("every page: no console errors, live charts, links resolve, no axe violations", async () => {
    for (const path of pages) {
      const { page, errors } = await openPage(context, `${server.origin}${PREFIX}${path}`, dialogs);
      const charts = await expectChartsLive(page);
      if (/^buildings\/[^/]+\.html$/.test(path)) expect(charts, path).toBeGreaterThan(0);
      await expectLinksResolve(page, server.origin, PREFIX);
      const axe = await runAxe(page);
      expect(axe.violations, `${path}: ${JSON.stringify(axe.violations)}`).toEqual([]);
      expect(errors, path).toEqual([]);
      await page.close();
    }
    expect(dialogs).toEqual([]);
  }, 300_000);

  it("forecast: the monthly chart is live on every building page with a forecast (band, P50 line, last year's points), with a budget table; the index ranks those buildings", async () => {
    const buildingPages = pages.filter((p) => /^buildings\/[^/]+\.html$/.test(p));
    let withForecast = 0;
    for (const path of buildingPages) {
      const { page, errors } = await openPage(context, `${server.origin}${PREFIX}${path}`, dialogs);
      const fig = page.locator('figure[id^="forecast-"]');
      if ((await fig.count()) === 0) {
        await page.close();
        continue;
      }
      withForecast++;
      await page.waitForFunction(() => document.querySelector('figure[id^="forecast-"]')?.getAttribute("data-chart-state") === "interactive");
      expect(await fig.locator(".chart-live .mark-area path").count(), path).toBe(1);
      expect(await fig.locator(".chart-live .mark-line path").count(), path).toBe(1);
      expect(await fig.locator(".chart-live .mark-symbol path").count(), path).toBeGreaterThanOrEqual(12);
      expect(await page.locator('table:has(caption:text("Budget by month and commodity")) tbody tr').count(), path).toBeGreaterThanOrEqual(3);
      expect(await page.locator('section[aria-labelledby="forecast-h"]').innerText()).toMatch(/Forecasts are estimates/);
      if (withForecast === 1) {
        await mkdir(ARTIFACTS, { recursive: true });
        await fig.screenshot({ path: join(ARTIFACTS, "demo-forecast-chart.png") });
      }
      expect(errors, path).toEqual([]);
      await page.close();
    }
    expect(withForecast).toBeGreaterThanOrEqual(6);
    const { page } = await openPage(context, `${server.origin}${PREFIX}index.html`, dialogs);
    const ranked = page.locator('section[aria-labelledby="forecast-h"] table tbody tr');
    expect(await ranked.count()).toBe(withForecast);
    const changes = await ranked.evaluateAll((rows) => rows.map((r) => Number((r as HTMLTableRowElement).cells[3].dataset.sort)));
    expect(changes).toEqual([...changes].sort((a, b) => b - a));
    await page.close();
  }, 120_000);

  it("the index's last-12-months use equals portfolio.json's actual_last_12m, its findings column findings.json and its To dispute column disputes.json", async () => {
    const json = JSON.parse(await readFile(join(siteDir, "data", "portfolio.json"), "utf8")) as {
      buildings: { name: string; [commodity: string]: unknown }[];
    };
    const findings = JSON.parse(await readFile(join(siteDir, "data", "findings.json"), "utf8")) as unknown;
    const findingList = (Array.isArray(findings) ? findings : (findings as { findings: unknown[] }).findings) as { building_id: string; amount_at_stake: number | null }[];
    const disputeList = JSON.parse(await readFile(join(siteDir, "data", "disputes.json"), "utf8")) as { building_id: string; kind: string; claim_amount: number }[];
    const { page } = await openPage(context, `${server.origin}${PREFIX}index.html`, dialogs);
    const table = page.locator('table:has(caption:text("Buildings: floor area"))');
    const header = await table.locator("thead th").allInnerTexts();
    const rows = await table.locator("tbody tr").evaluateAll((trs) =>
      trs.map((tr) => [...(tr as HTMLTableRowElement).cells].map((c) => ({ text: c.textContent?.trim() ?? "", sort: (c as HTMLElement).dataset.sort ?? null, href: c.querySelector("a")?.getAttribute("href") ?? null }))),
    );
    await page.close();
    // Header cells may carry a sort control after the label.
    const col = (label: string): number => header.findIndex((h) => h.trim().startsWith(label));
    expect(rows.length).toBe(json.buildings.length);
    let compared = 0;
    for (const b of json.buildings) {
      const row = rows.find((r) => r[0].text === b.name);
      expect(row, b.name).toBeDefined();
      for (const [commodity, label] of [["electricity", "Electricity use"], ["gas", "Gas use"], ["water", "Water use"]] as const) {
        const summary = b[commodity] as { actual_last_12m: number | null } | undefined;
        const cell = row![col(label)];
        if (!summary || summary.actual_last_12m === null) {
          expect(cell.text, `${b.name} ${commodity}`).toBe("—");
          continue;
        }
        // portfolio.json rounds to 3 decimals; the page keeps the full value for sorting.
        expect(Math.abs(Number(cell.sort) - summary.actual_last_12m), `${b.name} ${commodity}`).toBeLessThanOrEqual(0.0005 + 1e-9);
        compared++;
      }
      const id = (b as unknown as { building_id: string }).building_id;
      const mine = findingList.filter((f) => f.building_id === id);
      expect(Number(row![col("Findings")].sort), b.name).toBe(mine.length);
      expect(row![col("Findings")].href, b.name).toMatch(/^buildings\/[^/]+\.html#audit-h$/);
      // The building's claims, to the cent: its share of the index's "Bills to dispute".
      const claimedCents = disputeList.filter((d) => d.building_id === id && d.kind === "claim").reduce((s, d) => s + Math.round(d.claim_amount * 100), 0);
      expect(Math.round(Number(row![col("To dispute")].sort) * 100), b.name).toBe(claimedCents);
      if (claimedCents > 0) expect(row![col("To dispute")].href, b.name).toBe("disputes.html");
    }
    expect(compared).toBeGreaterThanOrEqual(20);
  }, 60_000);

  it("buildings.html lists every building of portfolio.json and forecast.html every building the index ranks; the index (8 buildings) shows them all with no link to the lists", async () => {
    const json = JSON.parse(await readFile(join(siteDir, "data", "portfolio.json"), "utf8")) as { buildings: { name: string }[] };
    const { page: list } = await openPage(context, `${server.origin}${PREFIX}buildings.html`, dialogs);
    const names = await list.locator('table:has(caption:text("Buildings: floor area")) tbody th').allInnerTexts();
    expect(names.map((n) => n.trim())).toEqual(json.buildings.map((b) => b.name));
    expect(await list.locator('nav a[aria-current="page"]').innerText()).toBe("Buildings");
    await list.close();
    const { page: index } = await openPage(context, `${server.origin}${PREFIX}index.html`, dialogs);
    expect(await index.locator('table:has(caption:text("Buildings: floor area")) tbody tr').count()).toBe(json.buildings.length);
    expect(await index.locator(".all-link").count()).toBe(0);
    const ranked = await index.locator('section[aria-labelledby="forecast-h"] table tbody th').allInnerTexts();
    await index.close();
    const { page: forecast } = await openPage(context, `${server.origin}${PREFIX}forecast.html`, dialogs);
    expect(await forecast.locator("table tbody th").allInnerTexts()).toEqual(ranked);
    await forecast.close();
  }, 60_000);

  it("asked no host other than 127.0.0.1", () => {
    expect(outsideRequests).toEqual([]);
  });
});
