// Issue 17, "both cores": buildings analysed in worker threads give the same site as one thread.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import { join, relative } from "node:path";
import { tmpdir } from "node:os";
import { buildPortfolioSite } from "../../src/pipeline/build.ts";
import { loadPortfolio } from "../../src/ingest/index.ts";
import { cutAtAsOf } from "../../src/pipeline/asOf.ts";
import { assessIntervalMeters } from "../../src/clean/index.ts";
import { analyseBuilding } from "../../src/pipeline/analyseBuilding.ts";
import { buildingTask, hydrateResults, plainResults, toPlain } from "../../src/pipeline/buildingTask.ts";
import type { Portfolio } from "../../src/domain/types.ts";
import type { Tariff } from "../../src/tariff/index.ts";
import { writeScalePortfolio } from "../../bench/lib/scalePortfolio.ts";

async function listFiles(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const entry of await readdir(dir, { withFileTypes: true, recursive: true })) {
    if (entry.isFile()) out.push(relative(dir, join(entry.parentPath, entry.name)));
  }
  return out.sort();
}

async function expectSameFiles(a: string, b: string): Promise<number> {
  const files = await listFiles(a);
  expect(await listFiles(b)).toEqual(files);
  for (const f of files) {
    const [x, y] = await Promise.all([readFile(join(a, f)), readFile(join(b, f))]);
    expect(x.equals(y), f).toBe(true);
  }
  return files.length;
}

describe("--jobs: buildings analysed in worker threads", () => {
  let root: string;
  beforeAll(async () => {
    root = await mkdtemp(join(tmpdir(), "ohmbook-jobs-"));
  });
  afterAll(async () => {
    await rm(root, { recursive: true, force: true });
  });

  it("writes every file byte for byte as a one-thread build (spec fixture: 3 buildings, one interval meter)", async () => {
    const dir = "test/fixtures/spec-portfolio";
    await buildPortfolioSite({ dir, outDir: join(root, "spec-1"), strict: false, jobs: 1 });
    await buildPortfolioSite({ dir, outDir: join(root, "spec-2"), strict: false, jobs: 2 });
    expect(await expectSameFiles(join(root, "spec-1"), join(root, "spec-2"))).toBeGreaterThan(10);
  }, 240_000);

  it("writes every file byte for byte as a one-thread build (two demo buildings, 15-minute data, planted findings)", async () => {
    // The demo's first two buildings: ashelm (three meters, a leak) and quill-tower (15-minute
    // data, multiplier 40, two planted billing errors).
    const dir = join(root, "demo-2");
    await writeScalePortfolio("data/demo", dir, 2);
    await buildPortfolioSite({ dir, outDir: join(root, "demo-2-j1"), strict: false, jobs: 1 });
    await buildPortfolioSite({ dir, outDir: join(root, "demo-2-j2"), strict: false, jobs: 2 });
    await expectSameFiles(join(root, "demo-2-j1"), join(root, "demo-2-j2"));
    const models = JSON.parse(await readFile(join(root, "demo-2-j2", "data", "models.json"), "utf8")) as { meter_id: string; hourly: unknown }[];
    expect(models.find((m) => m.meter_id === "TWR-E")?.hourly).toMatchObject({ chosen: expect.anything() });
  }, 240_000);
});

describe("plain results across the worker boundary", () => {
  it("drops functions, keeps maps and typed arrays, refuses class instances", () => {
    const plain = toPlain({ a: 1, f: () => 2, m: new Map([["k", { g: () => 3, v: new Float64Array([1.5]) }]]) });
    expect(plain).toEqual({ a: 1, m: new Map([["k", { v: new Float64Array([1.5]) }]]) });
    expect(structuredClone(plain)).toEqual(plain);
    class Money { constructor(readonly cents: number) {} }
    expect(() => toPlain({ x: [new Money(1)] })).toThrow(/results\.x\[0\] is a Money instance/);
  });

  it("a building's results survive structured clone, and every change-point fit is rebuilt bit for bit", async () => {
    const loaded = await loadPortfolio("data/demo");
    const quality = assessIntervalMeters(cutAtAsOf(loaded.portfolio!).portfolio);
    const portfolio = quality.portfolio as Portfolio<Tariff>;
    const masks = new Map(quality.meters.map((q) => [q.meterId, q.mask]));
    const building = portfolio.buildings.find((b) => b.buildingId === "ashelm")!;
    const direct = analyseBuilding(portfolio, building, masks);
    const task = buildingTask(portfolio, building, masks);
    expect(task.portfolio.meters.map((m) => m.meterId)).toEqual(["ASH-E", "ASH-G", "ASH-W"]);
    // The building's own bills and bill lines, in the portfolio's order.
    const own = new Set(["ASH-E", "ASH-G", "ASH-W"]);
    const ownBills = portfolio.bills.filter((b) => own.has(b.meterId));
    expect(task.portfolio.bills).toEqual(ownBills);
    const ownBillIds = new Set(ownBills.map((b) => b.billId));
    expect(task.portfolio.billLines).toEqual(portfolio.billLines.filter((l) => ownBillIds.has(l.billId)));
    expect(task.portfolio.billLines.length).toBeGreaterThan(0);
    const viaClone = hydrateResults(structuredClone(plainResults(analyseBuilding(task.portfolio, building, task.masks))));
    expect(viaClone.findings).toEqual(direct.findings);
    expect([...viaClone.priced.keys()]).toEqual([...direct.priced.keys()]);
    const fitted = direct.baselines.filter((b) => b.fit);
    expect(fitted.length).toBe(3);
    for (const b of fitted) {
      const rebuilt = viaClone.baselines.find((x) => x.meterId === b.meterId)!.fit!;
      expect(rebuilt.beta).toEqual(b.fit!.beta);
      for (const t of [-10, 0, 12.5, 18, 30]) {
        expect(rebuilt.predict(t)).toBe(b.fit!.predict(t));
        expect(rebuilt.predictWithInterval(t, 0.8, 30)).toEqual(b.fit!.predictWithInterval(t, 0.8, 30));
      }
    }
  }, 120_000);
});
