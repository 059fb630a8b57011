/**
 * The built site opened straight from disk (file://) in Debian's chromium: the stylesheet loads
 * and its rules apply, on the index and on a page one folder down. Chromium refuses a
 * `<link … crossorigin>` under file:// (the document's origin is null, so the CORS request
 * fails), which left the pages unstyled; the site writer drops the attribute on same-folder
 * assets (src/site/sameFolderAssets.ts).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtemp, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { chromium, type BrowserContext } from "playwright-core";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { writeSite } from "../../src/site/writeSite.ts";
import { fullFixtureInput } from "../report/fixture.ts";
import { dropSameFolderCrossorigin } from "../../src/site/sameFolderAssets.ts";
import { CHROMIUM, HAVE_CHROMIUM } from "./browser.ts";

describe("dropSameFolderCrossorigin", () => {
  it("removes crossorigin from relative asset URLs only", () => {
    expect(dropSameFolderCrossorigin('<link rel="stylesheet" crossorigin href="./assets/a.css"><script type="module" crossorigin="anonymous" src="../assets/b.js"></script>'))
      .toBe('<link rel="stylesheet" href="./assets/a.css"><script type="module" src="../assets/b.js"></script>');
    // Another origin keeps it: there CORS is what the attribute asks for.
    const remote = '<link rel="stylesheet" crossorigin href="https://cdn.example/a.css"><script crossorigin src="//cdn.example/b.js"></script>';
    expect(dropSameFolderCrossorigin(remote)).toBe(remote);
  });
});

if (!HAVE_CHROMIUM) console.warn(`file:// e2e skipped: ${CHROMIUM} not found (apt-get install -y chromium)`);

describe.skipIf(!HAVE_CHROMIUM)("the built site opened from disk (file://)", () => {
  let work: string;
  let site: string;
  let context: BrowserContext;
  const nonFileRequests: string[] = [];

  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-file-"));
    site = join(work, "site");
    await writeSite(buildSiteModel(fullFixtureInput()), { "findings.csv": "building_id\nB1\n" }, site);
    // The shared launcher only lets 127.0.0.1 through; here every request must be a file.
    context = await chromium.launchPersistentContext(join(work, "profile"), {
      executablePath: CHROMIUM,
      headless: true,
      args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
    });
    context.on("request", (r) => {
      if (!r.url().startsWith("file:") && !r.url().startsWith("data:")) nonFileRequests.push(r.url());
    });
  });

  afterAll(async () => {
    await context?.close();
    if (work) await rm(work, { recursive: true, force: true });
  });

  it("no same-folder stylesheet or script carries crossorigin", async () => {
    for (const page of ["index.html", "buildings/B1.html"]) {
      const html = await readFile(join(site, page), "utf8");
      const tags = html.match(/<(link|script)\b[^>]*>/g) ?? [];
      expect(tags.some((t) => /assets\//.test(t))).toBe(true);
      for (const tag of tags.filter((t) => /(href|src)="\.{0,2}\/?[^":]*assets\//.test(t))) expect(tag).not.toMatch(/\bcrossorigin\b/);
    }
  });

  for (const page of ["index.html", "buildings/B1.html"]) {
    it(`${page}: the stylesheet's rules apply under file://`, async () => {
      const tab = await context.newPage();
      const failed: string[] = [];
      tab.on("requestfailed", (r) => failed.push(`${r.url()} ${r.failure()?.errorText ?? ""}`));
      await tab.goto(pathToFileURL(join(site, page)).href, { waitUntil: "load" });
      // site.css: `.skip-link { position: absolute; … }` and `.site-header { display: flex; … }`;
      // the browser's defaults are `static` and `block`.
      const style = await tab.evaluate(() => ({
        skip: getComputedStyle(document.querySelector(".skip-link")!).position,
        header: getComputedStyle(document.querySelector(".site-header")!).display,
        // Rules of a file:// sheet cannot be read from script (a null origin); count the sheets.
        sheets: document.styleSheets.length,
      }));
      expect(failed.filter((f) => /\.css/.test(f))).toEqual([]);
      expect(style.skip).toBe("absolute");
      expect(style.header).toBe("flex");
      expect(style.sheets).toBeGreaterThan(0);
      // Tables and the server-rendered SVG charts show without the interactive layer.
      const shown = (selector: string) => tab.locator(selector).evaluateAll((els) => els.filter((e) => (e as HTMLElement).offsetParent !== null).length);
      expect(await shown("main table")).toBeGreaterThan(0);
      expect(await shown("figure[data-chart] .chart-fallback svg")).toBeGreaterThan(0);
      await tab.close();
    });
  }

  it("no request leaves the disk", () => {
    expect(nonFileRequests).toEqual([]);
  });
});
