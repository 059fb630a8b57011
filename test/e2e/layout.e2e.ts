/**
 * Layout of the demo site (data/demo) in chromium at a phone (390 px), a small laptop (1024 px)
 * and a desktop (1440 px) width: no page scrolls sideways, every amount in a table can be read
 * (on screen, never cut off by its table) and no line ends with an amount's sign, chart text is
 * never cut short or clipped, building pages stay small, every bill links to its re-pricing, no
 * raw state code reaches a page, and axe-core finds no violations in either table layout.
 */
import { afterAll, beforeAll, describe, expect, it, inject } from "vitest";
import { existsSync } from "node:fs";
import { mkdir, mkdtemp, readFile, readdir, rm, stat } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import type { BrowserContext, Page } from "playwright-core";
import { serveStatic, type RunningServer } from "./staticServer.ts";
import { ARTIFACTS, HAVE_CHROMIUM, launchBrowser, openAtWidth, runAxe } from "./browser.ts";
import { formatMoney, formatMoneySigned } from "../../src/report/format.ts";

const DEMO = resolve("data/demo");
const PREFIX = "/site/reports/";
const WIDTHS = [390, 1024, 1440] as const;
/** The limit for a building page's HTML. */
const BUILDING_PAGE_MAX_BYTES = 300_000;

/** What a page's layout looks like at the current viewport width (computed in the page). */
interface LayoutReport {
  innerWidth: number;
  scrollWidth: number;
  /** Elements reaching past the viewport's right edge that no scroll container of their own holds. */
  tooWide: string[];
  /** Amount cells (right-aligned number cells) not fully on screen, and tables that need scrolling. */
  amountsOffScreen: string[];
  tablesScrolling: string[];
  /** Chart text cut short with an ellipsis or reaching outside its chart. */
  chartTextClipped: string[];
}

/** Measures the page: run in the browser. */
function measureLayout(): LayoutReport {
  const vw = window.innerWidth;
  const describe = (e: Element): string => {
    const id = e.id ? `#${e.id}` : "";
    const cls = typeof e.className === "string" && e.className ? `.${e.className.split(/\s+/).join(".")}` : "";
    return `${e.tagName.toLowerCase()}${id}${cls} "${(e.textContent ?? "").trim().slice(0, 40)}"`;
  };
  const scrollsX = (e: Element): boolean => {
    const s = getComputedStyle(e);
    return (s.overflowX === "auto" || s.overflowX === "scroll") && e.clientWidth > 0;
  };
  const heldByScroller = (e: Element): boolean => {
    for (let p = e.parentElement; p; p = p.parentElement) if (scrollsX(p)) return true;
    return false;
  };
  const inSvg = (e: Element): boolean => e.closest("svg") !== null && e.tagName.toLowerCase() !== "svg";
  const tooWide = [...document.querySelectorAll("body *")]
    .filter((e) => {
      const r = e.getBoundingClientRect();
      return r.width > 0 && r.right > vw + 1 && !heldByScroller(e) && !inSvg(e) && e.id !== "chart-tooltip";
    })
    .slice(0, 10)
    .map(describe);
  const tablesScrolling = [...document.querySelectorAll("main .table-wrap")]
    .filter((w) => w.getBoundingClientRect().width > 0 && w.scrollWidth > w.clientWidth + 1)
    .map((w) => `${w.getAttribute("aria-label") ?? "table"}: ${w.scrollWidth} px in ${w.clientWidth} px`);
  // Amount cells: each must be wholly inside the viewport; inside a table that scrolls it must
  // at least be inside the scroll region's reach and the region itself on screen and focusable.
  const amountsOffScreen = [...document.querySelectorAll("main td.num")]
    .filter((c) => {
      const r = c.getBoundingClientRect();
      if (r.width === 0 || (c.textContent ?? "").trim() === "") return false;
      if (r.left >= -1 && r.right <= vw + 1) return false;
      const wrap = c.closest(".table-wrap");
      if (!wrap || !scrollsX(wrap)) return true;
      const wr = wrap.getBoundingClientRect();
      const reachable = r.right - wr.left <= wrap.scrollWidth + 1 - wrap.scrollLeft;
      return !(reachable && wr.right <= vw + 1 && wrap.getAttribute("tabindex") === "0");
    })
    .slice(0, 10)
    .map(describe);
  const chartTextClipped: string[] = [];
  for (const svg of document.querySelectorAll("figure[data-chart] svg")) {
    const box = svg.getBoundingClientRect();
    if (box.width === 0) continue;
    for (const t of svg.querySelectorAll("text")) {
      const r = t.getBoundingClientRect();
      const text = (t.textContent ?? "").trim();
      // Vega hides overlapping axis labels with opacity 0: they are not shown.
      if (r.width === 0 || text === "" || getComputedStyle(t).opacity === "0") continue;
      if (text.endsWith("…") || r.left < box.left - 1 || r.right > box.right + 1 || r.top < box.top - 1 || r.bottom > box.bottom + 1) {
        chartTextClipped.push(`${svg.closest("figure")?.id}: "${text}"`);
      }
    }
  }
  return { innerWidth: vw, scrollWidth: document.documentElement.scrollWidth, tooWide, amountsOffScreen, tablesScrolling, chartTextClipped };
}

/**
 * Signed amounts in `root`'s text whose sign ends one line while the "$" starts the next (the
 * amount then reads as positive): run in the browser.
 */
function signsApartIn(root: Element): string[] {
  const apart: string[] = [];
  const walker = document.createTreeWalker(root, NodeFilter.SHOW_TEXT);
  const range = document.createRange();
  const topOf = (node: Text, at: number): number => {
    range.setStart(node, at);
    range.setEnd(node, at + 1);
    return range.getBoundingClientRect().top;
  };
  for (let node = walker.nextNode() as Text | null; node; node = walker.nextNode() as Text | null) {
    if (node.parentElement?.closest("svg, script, style")) continue;
    for (const m of node.data.matchAll(/[+\u2212-]\u2060?\$/gu)) {
      const sign = m.index!;
      const dollar = sign + m[0].length - 1;
      const a = topOf(node, sign);
      const b = topOf(node, dollar);
      if (Math.abs(a - b) > 2) apart.push(`"${node.data.slice(Math.max(0, sign - 20), dollar + 10)}"`);
    }
  }
  return apart.slice(0, 10);
}

describe.skipIf(!HAVE_CHROMIUM || !existsSync(DEMO))("layout of the demo site at 390, 1024 and 1440 px", () => {
  let work = "";
  let site = "";
  let server: RunningServer;
  let context: BrowserContext;
  let pages: string[] = [];
  let buildingPages: string[] = [];
  let meterPages: string[] = [];
  const outsideRequests: string[] = [];
  const dialogs: string[] = [];

  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-layout-e2e-"));
    site = inject("demoSite");
    buildingPages = (await readdir(join(site, "buildings"))).filter((f) => f.endsWith(".html")).sort().map((f) => `buildings/${f}`);
    meterPages = (await readdir(join(site, "bills"), { recursive: true }))
      .map((f) => f.split("\\").join("/"))
      .filter((f) => f.endsWith(".html"))
      .sort()
      .map((f) => `bills/${f}`);
    // One building page with bills to look at (else the first), and the meter page its first bill links to.
    let building = buildingPages[0];
    let meter = meterPages[0];
    for (const b of buildingPages) {
      const m = /href="\.\.\/(bills\/[^"#]+\.html)#bill-/u.exec(await readFile(join(site, b), "utf8"));
      if (m) {
        building = b;
        meter = m[1];
        break;
      }
    }
    pages = ["index.html", building, meter];
    // A tenant page (the demo publishes some) and the methods page with its check cards.
    const tenant = (await readdir(join(site, "buildings"), { recursive: true })).map((f) => f.split("\\").join("/")).filter((f) => f.endsWith("/tenant.html")).sort()[0];
    if (tenant) pages.push(`buildings/${tenant}`);
    pages.push("methods.html");
    // The dispute list and a claim sheet, once the site has them.
    if (existsSync(join(site, "disputes.html"))) pages.push("disputes.html");
    // The lists of every building (the index shows only part of a long portfolio's).
    for (const list of ["buildings.html", "forecast.html"]) if (existsSync(join(site, list))) pages.push(list);
    if (existsSync(join(site, "claims"))) {
      const sheets = (await readdir(join(site, "claims"))).filter((f) => f.endsWith(".html")).sort();
      if (sheets.length) pages.push(`claims/${sheets[0]}`);
    }
    server = await serveStatic(site, PREFIX);
    context = await launchBrowser(join(work, "profile"), outsideRequests);
  }, 180_000);

  afterAll(async () => {
    await context?.close();
    await server?.close();
    if (work) await rm(work, { recursive: true, force: true });
  });

  async function openAt(path: string, width: number): Promise<{ page: Page; errors: string[] }> {
    return openAtWidth(context, `${server.origin}${PREFIX}${path}`, dialogs, width);
  }

  it("checks an index, a building page, a meter bills page, a tenant page and the methods page", () => {
    expect(pages.slice(0, 5)).toEqual(["index.html", expect.stringMatching(/^buildings\/[^/]+\.html$/), expect.stringMatching(/^bills\/[^/]+\/[^/]+\.html$/), expect.stringMatching(/^buildings\/[^/]+\/tenant\.html$/), "methods.html"]);
    expect(meterPages.length).toBeGreaterThanOrEqual(buildingPages.length);
  });

  it(`every building page's HTML is under ${BUILDING_PAGE_MAX_BYTES / 1000} KB`, async () => {
    expect(buildingPages.length).toBeGreaterThanOrEqual(6);
    const sizes: Record<string, number> = {};
    for (const p of buildingPages) sizes[p] = (await stat(join(site, p))).size;
    for (const [p, size] of Object.entries(sizes)) expect(size, `${p}: ${size} bytes`).toBeLessThan(BUILDING_PAGE_MAX_BYTES);
  });

  for (const width of WIDTHS) {
    it(`at ${width} px: no page scrolls sideways, every amount can be read, chart text is whole`, async () => {
      for (const path of pages) {
        const { page, errors } = await openAt(path, width);
        const r = await page.evaluate(measureLayout);
        expect(r.scrollWidth, `${path} at ${width} px`).toBeLessThanOrEqual(r.innerWidth);
        expect(r.tooWide, `${path} at ${width} px`).toEqual([]);
        expect(r.amountsOffScreen, `${path} at ${width} px`).toEqual([]);
        // From 1024 px up nothing is clipped: no table needs its own scrolling either.
        if (width >= 1024) expect(r.tablesScrolling, `${path} at ${width} px`).toEqual([]);
        expect(r.chartTextClipped, `${path} at ${width} px`).toEqual([]);
        expect(await page.locator("body").evaluate(signsApartIn), `${path} at ${width} px`).toEqual([]);
        // Restacked tables (390 px) and full tables alike stay accessible.
        if (width !== 1024) {
          const axe = await runAxe(page);
          expect(axe.violations, `${path} at ${width} px: ${JSON.stringify(axe.violations)}`).toEqual([]);
        }
        if (path === pages[1] || path.endsWith("/tenant.html")) {
          await mkdir(ARTIFACTS, { recursive: true });
          await page.screenshot({ path: join(ARTIFACTS, `layout-${path === pages[1] ? "building" : "tenant"}-${width}.png`) });
        }
        expect(errors, path).toEqual([]);
        await page.close();
      }
    }, 180_000);
  }

  // Unicode line breaking (UAX #14) allows a break between "−" and "$"; the pages' money joins
  // them (format.ts SIGN_JOINER). Here a sentence with one such amount is narrowed pixel by pixel
  // so that every possible break point is tried, first without the joiner (the check can fail:
  // Chromium does break there), then as the pages format it.
  it("a signed amount never ends a line with its sign, at any width", async () => {
    const page = await context.newPage();
    const sentence = (amount: string) => `<p id="t" style="font: 16px sans-serif; margin: 0">Billed more than the tariff: ${amount} over three bills</p>`;
    const apartAtSomeWidth = async (amount: string): Promise<string[]> => {
      await page.setContent(sentence(amount));
      const found: string[] = [];
      for (let w = 40; w <= 420; w += 2) {
        await page.evaluate((px) => (document.getElementById("t")!.style.width = `${px}px`), w);
        found.push(...(await page.locator("#t").evaluate(signsApartIn)));
      }
      return found;
    };
    expect(await apartAtSomeWidth("−$4,683.46")).not.toEqual([]);
    expect(await apartAtSomeWidth(formatMoneySigned(-4683.46, "USD"))).toEqual([]);
    expect(await apartAtSomeWidth(formatMoneySigned(4683.46, "USD"))).toEqual([]);
    expect(await apartAtSomeWidth(formatMoney(-4683.46, "USD"))).toEqual([]);
    await page.close();
  });

  it("a building page reads in a few screens at 1440 px (no per-bill detail on it)", async () => {
    const { page } = await openAt(pages[1], 1440);
    expect(await page.locator("section.bill, details.bill-math").count()).toBe(0);
    const height = await page.evaluate(() => document.documentElement.scrollHeight);
    expect(height, `${pages[1]}: ${height} px`).toBeLessThan(900 * 12);
    await page.close();
  });

  it("every bill on a building's bills tables links to an anchor that exists on its meter's bills page", async () => {
    const idsByPage = new Map<string, Set<string>>();
    const idsOf = async (path: string): Promise<Set<string>> => {
      let ids = idsByPage.get(path);
      if (!ids) {
        const html = await readFile(join(site, path), "utf8");
        ids = new Set([...html.matchAll(/\sid="([^"]+)"/gu)].map((m) => m[1]));
        idsByPage.set(path, ids);
      }
      return ids;
    };
    let links = 0;
    for (const building of buildingPages) {
      const { page } = await openAt(building, 1440);
      const hrefs = await page.$$eval('main table a[href*="#bill-"]', (as) => as.map((a) => (a as HTMLAnchorElement).href));
      await page.close();
      for (const href of hrefs) {
        const url = new URL(href);
        expect(url.pathname.startsWith(`${PREFIX}bills/`), href).toBe(true);
        const target = decodeURIComponent(url.pathname.slice(PREFIX.length));
        expect((await idsOf(target)).has(decodeURIComponent(url.hash.slice(1))), href).toBe(true);
        links++;
      }
    }
    // The demo plants several problem bills; each is listed on its building page.
    expect(links).toBeGreaterThanOrEqual(5);
    // And every row of every meter's own bills table points at a section of that page.
    for (const meter of meterPages) {
      const html = await readFile(join(site, meter), "utf8");
      const own = [...html.matchAll(/<th scope="row"[^>]*><a href="\.\.\/\.\.\/(bills\/[^"#]+)#(bill-[^"]+)"/gu)];
      expect(own.length, meter).toBeGreaterThan(0);
      for (const m of own) {
        expect(m[1], meter).toBe(meter);
        expect((await idsOf(meter)).has(m[2]), `${meter}#${m[2]}`).toBe(true);
      }
    }
  }, 120_000);

  it("every link on the checked pages resolves under the sub-path (the dispute list and claim sheets once the site has them)", async () => {
    const haveDisputes = existsSync(join(site, "disputes.html"));
    for (const path of pages) {
      const { page } = await openAt(path, 1440);
      const hrefs = await page.$$eval('a[href], link[href]:not([rel="canonical"])', (as) => as.map((a) => (a as HTMLAnchorElement).href));
      await page.close();
      for (const href of new Set(hrefs.map((h) => h.split("#")[0]))) {
        const url = new URL(href);
        if (url.origin !== server.origin) continue;
        if (!haveDisputes && /\/(disputes\.html|claims\/)/u.test(url.pathname)) continue;
        expect(url.pathname.startsWith(PREFIX), href).toBe(true);
        expect((await fetch(href)).status, `${path} → ${href}`).toBe(200);
      }
    }
  }, 120_000);

  it("no page shows a raw check-state or check code", async () => {
    const all = ["index.html", ...buildingPages, ...meterPages, ...pages.slice(3)];
    for (const path of all) {
      const html = await readFile(join(site, path), "utf8");
      // Page text: the markup without script blocks (chart specs) and tags.
      const text = html.replace(/<script\b[\s\S]*?<\/script>/gu, "").replace(/<[^>]+>/gu, " ");
      expect(text, path).not.toContain("needs-interval-data");
      // Nor a check code where its title belongs (e.g. why a bill was left out of a model).
      expect(text, path).not.toMatch(/audit finding: [a-z]+-[a-z-]+/u);
    }
    for (const path of pages) {
      const { page } = await openAt(path, 1024);
      expect(await page.locator("body").innerText(), path).not.toContain("needs-interval-data");
      await page.close();
    }
  }, 120_000);

  it("asked no host other than 127.0.0.1 and opened no dialog", () => {
    expect(outsideRequests).toEqual([]);
    expect(dialogs).toEqual([]);
  });
});
