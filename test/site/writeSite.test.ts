import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cp, mkdir, mkdtemp, readFile, readdir, rm, stat, utimes, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { buildSiteModel, siteModelInParts, tenantSiteModel } from "../../src/report/buildSiteModel.ts";
import { SiteWriteError, writeSite } from "../../src/site/writeSite.ts";
import { fixtureInput } from "../report/fixture.ts";

const DATA = {
  "findings.csv": "building_id,check\nB1,total-mismatch\n",
  "portfolio.json": "[]\n",
  "buildings/B1/bills.csv": "bill_id\nE1-01\n",
};

describe("writeSite", () => {
  let work: string;
  let out: string;

  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-site-"));
    out = join(work, "site");
    // A stale scratch folder from a killed build, with the Vite plugin's temp folder inside.
    await mkdir(join(work, ".site.ohmbook-build-stale", ".11ty-vite"), { recursive: true });
    await writeFile(join(work, ".site.ohmbook-build-stale", ".11ty-vite", "x.html"), "old");
    const twoHoursAgo = new Date(Date.now() - 2 * 3600_000);
    await utimes(join(work, ".site.ohmbook-build-stale"), twoHoursAgo, twoHoursAgo);
    // A scratch folder of a build running right now must be left alone.
    await mkdir(join(work, ".site.ohmbook-build-running"));
    await writeSite(buildSiteModel(fixtureInput()), DATA, out);
  }, 60_000);

  afterAll(async () => {
    await rm(work, { recursive: true, force: true });
  });

  it("writes index, building, methods and data pages, data files and a bundled script", async () => {
    const files = await readdir(out, { recursive: true });
    for (const f of [".ohmbook-site", "index.html", "methods.html", "data.html", "buildings.html", "forecast.html", "buildings/B1.html", "buildings/B2.html", "data/findings.csv", "data/portfolio.json"]) {
      expect(files).toContain(f);
    }
    expect(await readFile(join(out, "data/findings.csv"), "utf8")).toBe(DATA["findings.csv"]);
    const js = files.filter((f) => /^assets\/.*\.js$/.test(f));
    expect(js).toHaveLength(1);
    // The bundle holds the vega runtime, not a bare import the browser cannot resolve.
    const bundle = await readFile(join(out, js[0]), "utf8");
    expect(bundle).not.toMatch(/from\s*["'](vega|vega-interpreter|vega-embed)["']/);
    expect(bundle.length).toBeGreaterThan(300_000);
  });

  it("leaves no scratch folders behind, removes a stale one from a killed build, keeps a running build's", async () => {
    expect((await readdir(work)).sort()).toEqual([".site.ohmbook-build-running", "site"]);
    await rm(join(work, ".site.ohmbook-build-running"), { recursive: true });
  });

  it("links assets and pages relatively, so any path prefix works", async () => {
    const page = await readFile(join(out, "buildings/B1.html"), "utf8");
    expect(page).toMatch(/<script type="module" src="\.\.\/assets\/site-[\w-]+\.js"><\/script>/);
    expect(page).toMatch(/<link rel="stylesheet" href="\.\.\/assets\/site-[\w-]+\.css">/);
    const hrefs = [...page.matchAll(/\shref="([^"]*)"/g)].map((m) => m[1]);
    const absolute = hrefs.filter((h) => h.startsWith("/") || /^[a-z]+:\/\//.test(h));
    // Only the canonical link may be root-based (it carries base_path by design).
    expect(absolute).toEqual(["/reports/buildings/B1.html"]);
  });

  it("regression: with base_path / the canonical link stays a page URL (Vite once bundled the page into assets/)", async () => {
    const input = fixtureInput();
    input.portfolio.settings.basePath = "/";
    const rootOut = join(work, "root-site");
    await writeSite(buildSiteModel(input), {}, rootOut);
    const page = await readFile(join(rootOut, "buildings/B1.html"), "utf8");
    expect(page).toMatch(/<link rel="canonical" href="\/buildings\/B1\.html"\s*>/);
    const assets = await readdir(join(rootOut, "assets"));
    expect(assets.filter((f) => f.endsWith(".html"))).toEqual([]);
    await rm(rootOut, { recursive: true, force: true });
  }, 60_000);

  it("escapes a building name that is a script tag", async () => {
    const page = await readFile(join(out, "buildings/B2.html"), "utf8");
    expect(page).toContain("&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;Annex&quot;");
    expect(page).not.toContain("<script>alert(1)");
    const index = await readFile(join(out, "index.html"), "utf8");
    expect(index).not.toContain("<script>alert(1)");
  });

  it("embeds each chart as SVG fallback, compiled Vega spec (not Vega-Lite) and data table", async () => {
    const page = await readFile(join(out, "buildings/B1.html"), "utf8");
    const figures = page.match(/<figure class="chart"/g) ?? [];
    expect(figures).toHaveLength(2);
    const specs = [...page.matchAll(/<script type="application\/json" class="chart-spec">(.*?)<\/script>/gs)].map((m) => m[1]);
    expect(specs).toHaveLength(2);
    for (const s of specs) {
      expect(s).not.toContain("<");
      // Compiled on the server: the browser needs only the vega runtime.
      expect(JSON.parse(s).$schema).toBe("https://vega.github.io/schema/vega/v6.json");
    }
    expect(page.match(/<svg[^>]*role="img"/g)).toHaveLength(2);
    expect(page).toContain("<summary>Numbers behind this chart</summary>");
  });

  it("lists a building's own files (data/buildings/<id>/) on its page, relative to it", async () => {
    const b1 = await readFile(join(out, "buildings/B1.html"), "utf8");
    expect(b1).toContain('<a href="../data/buildings/B1/bills.csv" download>buildings/B1/bills.csv</a>');
    expect(await readFile(join(out, "data/buildings/B1/bills.csv"), "utf8")).toBe(DATA["buildings/B1/bills.csv"]);
    const b2 = await readFile(join(out, "buildings/B2.html"), "utf8");
    expect(b2).not.toContain("data/buildings/B1/");
  });

  it("a short portfolio's index lists every building with no link to the whole list (its page exists all the same)", async () => {
    const index = await readFile(join(out, "index.html"), "utf8");
    expect(index).not.toContain('class="more all-link"');
    expect(index).toContain('<li><a href="buildings.html">Buildings</a></li>');
    const list = await readFile(join(out, "buildings.html"), "utf8");
    expect(list.match(/<tr>\s*<th scope="row"/g)).toHaveLength(2);
  });

  it("puts the portfolio charts on the index (cost by month, intensity ranking) and the findings by check as a table", async () => {
    const index = await readFile(join(out, "index.html"), "utf8");
    expect(index).toContain('id="chart-portfolio-cost"');
    expect(index).toContain('id="chart-portfolio-eui"');
    expect(index).toContain("<caption>Findings by check");
    expect(index.match(/<svg[^>]*role="img"/g)).toHaveLength(2);
  });

  it("has the accessibility basics without JavaScript", async () => {
    const page = await readFile(join(out, "index.html"), "utf8");
    expect(page).toContain('<html lang="en">');
    expect(page).toContain('<link rel="icon" href="data:,">');
    expect(page).toContain('<a class="skip-link" href="#main">');
    expect(page).toContain('<main id="main"');
    expect(page).toMatch(/<caption>Buildings:/);
    expect(page).toContain('<th scope="col"');
    expect(page).toContain('<th scope="row"');
  });

  it("keeps the previous site when a build fails, and leaves nothing half-written", async () => {
    const before = await readFile(join(out, "index.html"), "utf8");
    const model = buildSiteModel(fixtureInput());
    // Two buildings on one page path: Eleventy refuses duplicate output paths.
    model.buildings[1] = { ...model.buildings[1], path: model.buildings[0].path };
    await expect(writeSite(model, DATA, out)).rejects.toBeInstanceOf(SiteWriteError);
    expect(await readFile(join(out, "index.html"), "utf8")).toBe(before);
    expect((await readdir(work)).sort()).toEqual(["site"]);
  }, 60_000);

  it("refuses to replace a folder it did not write, the current folder, or a file", async () => {
    const foreign = join(work, "foreign");
    await mkdir(foreign);
    await writeFile(join(foreign, "thesis.docx"), "precious");
    const model = buildSiteModel(fixtureInput());
    await expect(writeSite(model, {}, foreign)).rejects.toThrow(/not written by ohmbook/);
    expect(await readFile(join(foreign, "thesis.docx"), "utf8")).toBe("precious");
    await expect(writeSite(model, {}, process.cwd())).rejects.toThrow(/current folder/);
    await expect(writeSite(model, {}, join(process.cwd(), ".."))).rejects.toThrow(/current folder/);
    await expect(writeSite(model, {}, join(foreign, "thesis.docx"))).rejects.toThrow(/is a file/);
    await rm(foreign, { recursive: true, force: true });
  });

  it("reports Vite's own error when bundling fails, and writes nothing", async () => {
    const content = join(work, "content-broken");
    await cp(resolve("content"), content, { recursive: true });
    await writeFile(join(content, "assets", "site.js"), 'import missing from "./does-not-exist.js";\nmissing();\n');
    const target = join(work, "broken-out");
    const error = await writeSite(buildSiteModel(fixtureInput()), {}, target, { contentDir: content }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(SiteWriteError);
    expect((error as Error).message).toMatch(/bundling scripts and styles \(Vite\).*does-not-exist\.js/s);
    expect((error as Error).message).not.toContain("\u001b[");
    await expect(stat(target)).rejects.toThrow();
    await rm(content, { recursive: true, force: true });
    expect((await readdir(work)).sort()).toEqual(["site"]);
  }, 60_000);

  it("passes on unchanged an error raised while a data file is made, and leaves the published site as it was", async () => {
    const before = await readFile(join(out, "index.html"));
    const bug = new TypeError("a bug in a data file");
    function* data(): Generator<[string, string]> {
      yield ["findings.csv", "building_id\n"];
      throw bug;
    }
    await expect(writeSite(buildSiteModel(fixtureInput()), data(), out)).rejects.toBe(bug);
    expect((await readFile(join(out, "index.html"))).equals(before)).toBe(true);
    expect(await readFile(join(out, "data", "findings.csv"), "utf8")).toBe(DATA["findings.csv"]);
  }, 60_000);

  it("creates no output folder when the first build fails", async () => {
    const fresh = join(work, "never");
    await expect(writeSite(buildSiteModel(fixtureInput()), { "../escape.csv": "x" }, fresh)).rejects.toThrow(/outside data/);
    await expect(stat(fresh)).rejects.toThrow();
    expect((await readdir(work)).sort()).toEqual(["site"]);
  }, 60_000);

  it("writes the same site byte for byte whether building pages are rendered one per pass or all in one, made up front or per pass, and data files given whole or one at a time", async () => {
    const model = buildSiteModel(fixtureInput());
    expect(model.buildings.length).toBeGreaterThan(1);
    expect(model.meterBills.length).toBeGreaterThan(model.buildings.length);
    const all = join(work, "all-in-one");
    await writeSite(model, DATA, all, { buildingsPerPass: 1000 });
    const list = async (dir: string) => (await readdir(dir, { recursive: true, withFileTypes: true })).filter((e) => e.isFile()).map((e) => join(e.parentPath, e.name).slice(dir.length + 1)).sort();
    const files = await list(all);
    expect(files.filter((f) => f.startsWith("buildings/")).length).toBe(model.buildings.length);
    const variants: [string, Parameters<typeof writeSite>[0], Parameters<typeof writeSite>[1]][] = [
      ["one-per-pass", model, DATA],
      ["in-parts-one-per-pass", siteModelInParts(fixtureInput()), DATA],
      ["data-one-at-a-time", siteModelInParts(fixtureInput()), (function* () { yield* Object.entries(DATA); })()],
    ];
    for (const [name, source, data] of variants) {
      const dir = join(work, name);
      await writeSite(source, data, dir, { buildingsPerPass: 1 });
      expect(await list(dir)).toEqual(files);
      for (const f of files) expect((await readFile(join(dir, f))).equals(await readFile(join(all, f))), `${name}: ${f}`).toBe(true);
      await rm(dir, { recursive: true, force: true });
    }
    await rm(all, { recursive: true, force: true });
    // The tenant site has tenant pages and no building pages: every pass still writes them.
    const withTenants = fixtureInput();
    withTenants.portfolio = { ...withTenants.portfolio, buildings: withTenants.portfolio.buildings.map((b) => ({ ...b, tenantPage: true })) };
    const tenantModel = buildSiteModel(withTenants);
    const tenantsAll = join(work, "tenants-all");
    const tenantsOne = join(work, "tenants-one");
    await writeSite(tenantSiteModel(tenantModel), {}, tenantsAll, { buildingsPerPass: 1000 });
    await writeSite(tenantSiteModel(tenantModel), {}, tenantsOne, { buildingsPerPass: 1 });
    const tenantFiles = await list(tenantsAll);
    expect(tenantModel.tenants.length).toBeGreaterThan(1);
    expect(tenantFiles.filter((f) => f.endsWith("tenant.html")).length).toBe(tenantModel.tenants.length);
    expect(await list(tenantsOne)).toEqual(tenantFiles);
    for (const f of tenantFiles) expect((await readFile(join(tenantsOne, f))).equals(await readFile(join(tenantsAll, f))), f).toBe(true);
    await rm(tenantsAll, { recursive: true, force: true });
    await rm(tenantsOne, { recursive: true, force: true });
  }, 120_000);
});
