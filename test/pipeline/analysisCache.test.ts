// Issue 17, "incremental rebuild": a building's analysis is reused while its inputs, the settings
// and the program are unchanged; changing one bill re-analyses that building only, and the site
// is the one a build without the cache writes.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cp, mkdtemp, readdir, readFile, rm, writeFile } from "node:fs/promises";
import { join, relative } from "node:path";
import { tmpdir } from "node:os";
import { buildPortfolioSite } from "../../src/pipeline/build.ts";
import { cacheKey, defaultCacheDir, keyTariffs, openAnalysisCache, writeCached } from "../../src/pipeline/analysisCache.ts";
import { threadsWorthStarting } from "../../src/pipeline/analysisPool.ts";
import { contentHash } from "../../src/core/contentHash.ts";
import { buildingTask, type PlainResults } from "../../src/pipeline/buildingTask.ts";
import { runCli, type CliIo } from "../../src/cli/main.ts";
import { loadPortfolio } from "../../src/ingest/index.ts";
import type { Portfolio } from "../../src/domain/types.ts";
import type { Tariff } from "../../src/tariff/index.ts";

async function listFiles(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const entry of await readdir(dir, { withFileTypes: true, recursive: true })) {
    if (entry.isFile()) out.push(relative(dir, join(entry.parentPath, entry.name)));
  }
  return out.sort();
}

async function expectSameFiles(a: string, b: string): Promise<void> {
  const files = await listFiles(a);
  expect(await listFiles(b)).toEqual(files);
  for (const f of files) expect((await readFile(join(b, f))).equals(await readFile(join(a, f))), f).toBe(true);
}

describe("analysis cache", () => {
  let work: string;
  let dir: string;
  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-cache-"));
    dir = join(work, "portfolio");
    await cp("test/fixtures/spec-portfolio", dir, { recursive: true });
  });
  afterAll(async () => {
    await rm(work, { recursive: true, force: true });
  });

  it("reuses unchanged buildings, re-analyses the one whose bill changed, and writes the site a build without cache writes", async () => {
    const cacheDir = join(work, "cache");
    const first = await buildPortfolioSite({ dir, outDir: join(work, "a"), strict: false, jobs: 1, cacheDir });
    expect(first.summary.buildingsFromCache).toBe(0);
    const second = await buildPortfolioSite({ dir, outDir: join(work, "b"), strict: false, jobs: 2, cacheDir });
    expect(second.summary.buildingsFromCache).toBe(3);
    await expectSameFiles(join(work, "a"), join(work, "b"));

    // One bill of EAST-3's water meter: its total changes by 10.00.
    const bills = await readFile(join(dir, "bills.csv"), "utf8");
    const lines = bills.split("\n");
    const i = lines.findIndex((l) => l.startsWith("E3-W,"));
    const cells = lines[i]!.split(",");
    cells[7] = (Number(cells[7]) + 10).toFixed(2);
    lines[i] = cells.join(",");
    await writeFile(join(dir, "bills.csv"), lines.join("\n"));

    const third = await buildPortfolioSite({ dir, outDir: join(work, "c"), strict: false, jobs: 1, cacheDir });
    expect(third.summary.buildingsFromCache).toBe(2);
    const fresh = await buildPortfolioSite({ dir, outDir: join(work, "d"), strict: false, jobs: 1 });
    expect(fresh.summary.buildingsFromCache).toBe(0);
    await expectSameFiles(join(work, "d"), join(work, "c"));

    // Into the same folder again after another change to that bill: the other buildings' pages
    // are copied from the published site, and the site is still the fresh build's.
    cells[7] = (Number(cells[7]) + 10).toFixed(2);
    lines[i] = cells.join(",");
    await writeFile(join(dir, "bills.csv"), lines.join("\n"));
    const fourth = await buildPortfolioSite({ dir, outDir: join(work, "c"), strict: false, jobs: 1, cacheDir });
    expect(fourth.summary.pagesReused).toBeGreaterThan(0);
    expect(fourth.summaryText).toMatch(/page\(s\) unchanged since the last build \(building, meter, tenant pages and claim sheets\): copied from the previous site/);
    await buildPortfolioSite({ dir, outDir: join(work, "d"), strict: false, jobs: 1 });
    await expectSameFiles(join(work, "d"), join(work, "c"));
  }, 300_000);

  it("one interval reading changed: re-analyses that meter's building only, makes its pages again, and writes the site a build without cache writes", async () => {
    const cacheDir = join(work, "cache-readings");
    const out = join(work, "readings");
    await buildPortfolioSite({ dir, outDir: out, strict: false, jobs: 1, cacheDir });
    // The 50th reading of SOUTH-2's electricity meter, 20 → 21 kWh.
    const file = join(dir, "intervals", "S2-E-2025-01.csv");
    const original = await readFile(file, "utf8");
    const rows = original.split("\n");
    const cells = rows[50]!.split(",");
    cells[2] = String(Number(cells[2]) + 1);
    rows[50] = cells.join(",");
    await writeFile(file, rows.join("\n"));
    try {
      const rebuilt = await buildPortfolioSite({ dir, outDir: out, strict: false, jobs: 1, cacheDir });
      expect(rebuilt.summary.buildingsFromCache).toBe(2);
      expect(rebuilt.summary.pagesReused).toBeGreaterThan(0);
      await buildPortfolioSite({ dir, outDir: join(work, "readings-fresh"), strict: false, jobs: 1 });
      await expectSameFiles(join(work, "readings-fresh"), out);
    } finally {
      await writeFile(file, original);
    }
  }, 300_000);

  it("keys on the program and the settings as well as the building's own data", async () => {
    const loaded = await loadPortfolio("test/fixtures/spec-portfolio");
    const portfolio = loaded.portfolio as Portfolio<Tariff>;
    const cache = await openAnalysisCache(join(work, "keys"));
    keyTariffs(cache, portfolio.tariffs);
    const building = portfolio.buildings[0]!;
    const key = cacheKey(cache, buildingTask(portfolio, building, new Map()));
    expect(cacheKey(cache, buildingTask(portfolio, building, new Map()))).toBe(key);
    expect(cacheKey({ ...cache, program: "another version" }, buildingTask(portfolio, building, new Map()))).not.toBe(key);
    expect(cacheKey({ ...cache, tariffs: "other tariffs" }, buildingTask(portfolio, building, new Map()))).not.toBe(key);
    const otherSettings = { ...portfolio, settings: { ...portfolio.settings, tolerances: { ...portfolio.settings.tolerances, usagePct: 9 } } };
    expect(cacheKey(cache, buildingTask(otherSettings, building, new Map()))).not.toBe(key);
    // Another building's bills do not touch this building's key.
    const otherBills = { ...portfolio, bills: portfolio.bills.map((b) => (b.meterId === "E3-W" ? { ...b, total: b.total + 1 } : b)) };
    expect(cacheKey(cache, buildingTask(otherBills, building, new Map()))).toBe(key);
  }, 60_000);

  it("starts threads only with two or more buildings missing from the cache, and keeps the keys it worked out", async () => {
    const loaded = await loadPortfolio("test/fixtures/spec-portfolio");
    const portfolio = loaded.portfolio as Portfolio<Tariff>;
    const cache = await openAnalysisCache(join(work, "threads"));
    keyTariffs(cache, portfolio.tariffs);
    const { buildings } = portfolio;
    expect(buildings.length).toBeGreaterThanOrEqual(3);
    const keyOf = (i: number) => cacheKey(cache, buildingTask(portfolio, buildings[i]!, new Map()));
    // Nothing cached: threads as asked, after the keys of the first two buildings only.
    const cold = threadsWorthStarting(portfolio, buildings, new Map(), 2, cache, "fail");
    expect(cold.threads).toBe(2);
    expect(cold.keys.filter((k) => k !== undefined)).toEqual([keyOf(0), keyOf(1)]);
    // Every building but the last cached: it is analysed in this thread; every key is kept.
    for (let i = 0; i < buildings.length - 1; i++) await writeCached(cache, keyOf(i), {} as PlainResults);
    const warm = threadsWorthStarting(portfolio, buildings, new Map(), 2, cache, "fail");
    expect(warm.threads).toBe(1);
    expect(warm.keys).toEqual(buildings.map((_, i) => keyOf(i)));
    // Two missing: threads again.
    await rm(join(cache.dir, `${keyOf(0)}.v8`));
    expect(threadsWorthStarting(portfolio, buildings, new Map(), 2, cache, "fail").threads).toBe(2);
    // Without a cache, or with one job, nothing is worked out ahead.
    expect(threadsWorthStarting(portfolio, buildings, new Map(), 2, null, "fail")).toEqual({ threads: 2, keys: new Array(buildings.length) });
    expect(threadsWorthStarting(portfolio, buildings, new Map(), 1, cache, "fail").keys.every((k) => k === undefined)).toBe(true);
  }, 60_000);

  it("hashes content, not V8's storage of it", () => {
    const a = { x: 1, y: [2, 3], m: new Map([["k", new Float64Array([0.5])]]) };
    const b = { m: new Map([["k", new Float64Array([0.5])]]), y: [1.5 + 0.5, 3], x: 0.25 * 4 };
    expect(contentHash(b)).toBe(contentHash(a));
    expect(contentHash({ ...a, x: 1.0000001 })).not.toBe(contentHash(a));
    expect(contentHash({ ...a, m: new Map([["k", new Float64Array([0.25])]]) })).not.toBe(contentHash(a));
    expect(contentHash(["ab", "c"])).not.toBe(contentHash(["a", "bc"]));
  });

  it("the CLI keeps the cache beside the output folder, and refuses one inside it", async () => {
    expect(defaultCacheDir("/srv/www/_site")).toBe("/srv/www/._site.ohmbook-cache");
    const io = (): CliIo & { stderr: string } => {
      const r = { stderr: "", out: () => {}, err: (s: string) => (r.stderr += s), isTty: false, sourceDateEpoch: "" };
      return r;
    };
    const bad = io();
    expect(await runCli(["build", dir, "--out", join(work, "e"), "--cache", join(work, "e", "cache"), "--quiet"], bad)).toBe(1);
    expect(bad.stderr).toMatch(/refusing to keep the cache in .*inside it/);
    expect(bad.stderr).not.toMatch(/at .*\.ts:\d+/);
  }, 60_000);
});
