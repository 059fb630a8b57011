/**
 * The finance reader's pages on the demo portfolio (data/demo) in chromium, under a sub-path:
 * the index's "Bills to dispute" figure equals the dispute list's total and disputes.json; every
 * claim's sheet exists and states the table's amount; claim sheets print without navigation;
 * nothing is wider than the screen at 390, 1024 and 1440 px; axe-core finds no violations.
 */
import { afterAll, beforeAll, describe, expect, it, inject } from "vitest";
import { existsSync } from "node:fs";
import { mkdtemp, readFile, readdir, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import type { BrowserContext, Page } from "playwright-core";
import { serveStatic, type RunningServer } from "./staticServer.ts";
import { HAVE_CHROMIUM, expectLinksResolve, launchBrowser, openPage, runAxe } from "./browser.ts";

const DEMO = resolve("data/demo");
const PREFIX = "/finance/reports/";

/** A table row of a dispute table as the page shows it. */
interface Row {
  id: string;
  building: string;
  amountText: string;
  amount: number;
  sheetHref: string;
}

async function tableRows(page: Page, tableId: string): Promise<Row[]> {
  if ((await page.locator(`#${tableId}`).count()) === 0) return [];
  return page.locator(`#${tableId} tbody tr`).evaluateAll((trs) =>
    trs.map((tr) => {
      const amountCell = tr.querySelector("td.amount") as HTMLElement;
      const link = tr.querySelector("a.sheet-link") as HTMLAnchorElement;
      return {
        id: (tr as HTMLElement).dataset.dispute ?? "",
        building: tr.querySelector("th a")?.textContent ?? "",
        amountText: amountCell.textContent?.trim() ?? "",
        amount: Number(amountCell.dataset.amount),
        sheetHref: link.href,
      };
    }),
  );
}

/** Whole cents of a list of two-decimal amounts (exact, as a spreadsheet adds them). */
function cents(amounts: number[]): number {
  return amounts.reduce((s, a) => s + Math.round(a * 100), 0);
}

function usd(centsTotal: number): string {
  return new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" }).format(centsTotal / 100);
}

describe.skipIf(!HAVE_CHROMIUM || !existsSync(DEMO))("bills to dispute on the demo site", () => {
  let work: string;
  let siteDir: string;
  let server: RunningServer;
  let context: BrowserContext;
  let claimPages: string[] = [];
  let disputesJson: { dispute_id: string; kind: string; claim_amount: number }[] = [];
  const outsideRequests: string[] = [];
  const dialogs: string[] = [];
  const url = (path: string): string => `${server.origin}${PREFIX}${path}`;

  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-disputes-e2e-"));
    siteDir = inject("demoSite");
    claimPages = (await readdir(join(siteDir, "claims"))).filter((f) => f.endsWith(".html")).map((f) => `claims/${f}`);
    disputesJson = JSON.parse(await readFile(join(siteDir, "data", "disputes.json"), "utf8")) as typeof disputesJson;
    server = await serveStatic(siteDir, PREFIX);
    context = await launchBrowser(join(work, "profile"), outsideRequests);
  }, 180_000);

  afterAll(async () => {
    await context?.close();
    await server?.close();
    if (work) await rm(work, { recursive: true, force: true });
  });

  it("the index's Bills to dispute figure = the dispute list's claim total = Σ claim_amount over kind claim in disputes.json", async () => {
    const claimsJson = disputesJson.filter((d) => d.kind === "claim");
    expect(claimsJson.length).toBeGreaterThan(0);
    const expected = usd(cents(claimsJson.map((d) => d.claim_amount)));

    const { page: index } = await openPage(context, url("index.html"), dialogs);
    const tile = (await index.locator("#dispute-total").innerText()).trim();
    expect(tile).toBe(expected);
    expect(await index.locator("#dispute-total").getAttribute("href")).toBe("disputes.html");
    // Cost first: the money cards (claims, risk, next year's and last year's cost) lead, then the dispute block.
    const headings = await index.locator("main h2").allInnerTexts();
    expect(headings.slice(0, 2)).toEqual(["Money at stake and next year's cost", "Bills to dispute"]);
    expect(await index.locator("#money-h + .figure-cards .card-label").allInnerTexts()).toEqual([
      "Bills to dispute", "Budget risk: may be billed later", "Forecast cost, next 12 months", "Billed cost, last 12 months",
    ]);
    // The index table lists the largest claims (at most 10), largest first.
    const indexRows = await tableRows(index, "index-claims");
    expect(indexRows.length).toBe(Math.min(10, claimsJson.length));
    expect(indexRows.map((r) => r.amount)).toEqual([...indexRows.map((r) => r.amount)].sort((a, b) => b - a));
    await index.close();

    const { page: list } = await openPage(context, url("disputes.html"), dialogs);
    const rows = await tableRows(list, "claims");
    expect(rows.map((r) => r.id).sort()).toEqual(claimsJson.map((d) => d.dispute_id).sort());
    expect(usd(cents(rows.map((r) => r.amount)))).toBe(tile);
    const footer = (await list.locator("#claims tfoot tr").last().locator("td.amount").innerText()).trim();
    expect(footer).toBe(tile);
    // Each row's amount is the dispute's own claim_amount.
    const byId = new Map(disputesJson.map((d) => [d.dispute_id, d]));
    for (const r of rows) expect(r.amount, r.id).toBe(byId.get(r.id)!.claim_amount);
    // Back-billing risks are listed apart and are not in the claim total.
    const risks = await tableRows(list, "risks");
    expect(risks.map((r) => r.id).sort()).toEqual(disputesJson.filter((d) => d.kind === "back-bill-risk").map((d) => d.dispute_id).sort());
    for (const r of risks) expect(r.amount, r.id).toBe(-byId.get(r.id)!.claim_amount);
    // The building whose name is markup shows as text.
    const names = [...rows, ...risks].map((r) => r.building);
    if (names.some((n) => n.includes("Ash & Elm"))) expect(names).toContain('Ash & Elm "Commons" <North>');
    expect(await list.locator("a[href$='data/disputes.csv']").count()).toBe(1);
    expect(await list.locator("a[href$='data/disputes.json']").count()).toBe(1);
    expect(await list.locator("section.cautions").innerText()).toMatch(/approved by the regulator governs[\s\S]*look-back/);
    await list.close();
  });

  it("every claim sheet link resolves to a page whose amount is the table's", async () => {
    const { page: list } = await openPage(context, url("disputes.html"), dialogs);
    const rows = [...(await tableRows(list, "claims")), ...(await tableRows(list, "risks"))];
    await list.close();
    expect(rows.length).toBe(claimPages.length);
    for (const r of rows) {
      expect(new URL(r.sheetHref).pathname.startsWith(PREFIX), r.sheetHref).toBe(true);
      const { page, errors } = await openPage(context, r.sheetHref, dialogs);
      expect((await page.locator("#claim-amount").innerText()).trim(), r.id).toBe(r.amountText);
      expect(await page.locator("h1").innerText()).toMatch(/^(Claim|Budget note): /);
      expect(await page.locator("section.cautions").innerText()).toMatch(/approved by the regulator governs/);
      expect(errors, r.sheetHref).toEqual([]);
      await page.close();
    }
  }, 120_000);

  it("a claim sheet prints without navigation or screen-only links, and fits A4 and Letter widths", async () => {
    const { page } = await openPage(context, url(claimPages[0]), dialogs);
    expect(await page.locator(".site-header nav").isVisible()).toBe(true);
    await page.emulateMedia({ media: "print" });
    expect(await page.locator(".site-header nav").isVisible()).toBe(false);
    expect(await page.locator(".sheet-links").isVisible()).toBe(false);
    expect(await page.locator("#claim-amount").isVisible()).toBe(true);
    // A4 (210 mm) and Letter (8.5 in) less 12 mm margins each side, at 96 px per inch.
    for (const widthPx of [Math.floor(((210 - 24) / 25.4) * 96), Math.floor((8.5 - 24 / 25.4) * 96)]) {
      await page.setViewportSize({ width: widthPx, height: 1000 });
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow, `print width ${widthPx}px`).toBeLessThanOrEqual(0);
    }
    await page.close();
  });

  it("nothing is wider than the screen at 390, 1024 and 1440 px (no sideways scrolling of the dispute pages), and no dispute table hides its amount column", async () => {
    const paths = ["index.html", "disputes.html", ...claimPages];
    for (const width of [390, 1024, 1440]) {
      const page = await context.newPage();
      await page.setViewportSize({ width, height: 900 });
      for (const path of paths) {
        await page.goto(url(path), { waitUntil: "networkidle" });
        const found = await page.evaluate(() => {
          const vw = document.documentElement.clientWidth;
          const scope = document.querySelector(".dispute-block") ?? document.querySelector("main")!;
          const wide = [...scope.querySelectorAll("*")]
            // Content inside a scrolling table box (the index's other tables) scrolls within it.
            .filter((e) => !e.parentElement?.closest(".table-wrap:not(.dispute-wrap)"))
            .filter((e) => e.getBoundingClientRect().right > vw + 1)
            .map((e) => `${e.tagName.toLowerCase()}.${e.className}`);
          const scrolled = [...document.querySelectorAll(".dispute-wrap")].filter((w) => w.scrollWidth > w.clientWidth + 1).length;
          const amountsHidden = [...document.querySelectorAll(".dispute-table td.amount")].filter((c) => c.getBoundingClientRect().right > vw + 1).length;
          const pageScroll = Math.max(0, document.documentElement.scrollWidth - vw);
          return { wide: wide.slice(0, 5), scrolled, amountsHidden, pageScroll };
        });
        expect(found, `${path} at ${width}px`).toEqual({ wide: [], scrolled: 0, amountsHidden: 0, pageScroll: 0 });
      }
      await page.close();
    }
  }, 120_000);

  it("the index, the dispute list and every claim sheet: no axe violations, no console errors", async () => {
    for (const path of ["index.html", "disputes.html", ...claimPages]) {
      const { page, errors } = await openPage(context, url(path), dialogs);
      const axe = await runAxe(page);
      expect(axe.violations, `${path}: ${JSON.stringify(axe.violations)}`).toEqual([]);
      expect(errors, path).toEqual([]);
      await page.close();
    }
    expect(dialogs).toEqual([]);
    expect(outsideRequests).toEqual([]);
  }, 180_000);

  it("every link of the dispute list and the claim sheets resolves under the sub-path (building pages, each meter's bills page, the data files)", async () => {
    for (const path of ["disputes.html", ...claimPages]) {
      const { page } = await openPage(context, url(path), dialogs);
      await expectLinksResolve(page, server.origin, PREFIX);
      await page.close();
    }
  }, 120_000);

  it("works without JavaScript: the figure, the tables and the claim sheets are plain HTML", async () => {
    const noJs = await launchBrowser(join(work, "profile-nojs"), outsideRequests, false);
    try {
      const { page } = await openPage(noJs, url("index.html"), dialogs);
      expect((await page.locator("#dispute-total").innerText()).trim()).toMatch(/^\$[\d,]+\.\d\d$/);
      expect(await page.locator("#index-claims tbody tr").count()).toBeGreaterThan(0);
      await page.close();
      const { page: sheet } = await openPage(noJs, url(claimPages[0]), dialogs);
      expect(await sheet.locator("#claim-amount").isVisible()).toBe(true);
      await sheet.close();
    } finally {
      await noJs.close();
    }
  });
});
