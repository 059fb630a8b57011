// Issue 17, "incremental rebuild": pages whose inputs are unchanged are copied from the site the
// last build published; the result is byte for byte the site a full render writes, and a page
// changed by hand in the published folder is rendered again, never trusted.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtemp, readdir, readFile, rm, stat, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { buildSiteModel, siteModelInParts, type SiteModelInParts } from "../../src/report/buildSiteModel.ts";
import type { ReportInput } from "../../src/report/input.ts";
import { writeSite } from "../../src/site/writeSite.ts";
import { fixtureInput, fullFixtureInput, withForecastMethod } from "../report/fixture.ts";
import { disputeFixture } from "../report/disputeFixture.ts";

const DATA = { "findings.csv": "building_id,check\nB1,total-mismatch\n", "buildings/B1/bills.csv": "bill_id\nE1-01\n" };

async function tree(dir: string): Promise<Map<string, Buffer>> {
  const out = new Map<string, Buffer>();
  for (const e of await readdir(dir, { withFileTypes: true, recursive: true })) {
    if (e.isFile()) out.set(relative(dir, join(e.parentPath, e.name)), await readFile(join(e.parentPath, e.name)));
  }
  return out;
}

function expectSameTree(a: Map<string, Buffer>, b: Map<string, Buffer>): void {
  expect([...b.keys()].sort()).toEqual([...a.keys()].sort());
  for (const [f, bytes] of a) expect(b.get(f)!.equals(bytes), f).toBe(true);
}

describe("page reuse", () => {
  let work: string;
  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-reuse-"));
  });
  afterAll(async () => {
    await rm(work, { recursive: true, force: true });
  });

  it("copies unchanged pages and the bundle, renders changed ones, and writes what a full render writes", async () => {
    const reuse = { cacheDir: join(work, "cache"), program: "test-program" };
    const out = join(work, "site");
    const model = buildSiteModel(fixtureInput());
    const first = await writeSite(model, DATA, out, { reuse });
    expect(first.pagesReused).toBe(0);
    expect(first.bundleReused).toBe(false);
    const perBuilding = model.buildings.length + model.meterBills.length + model.tenants.length + model.claims.length;
    expect(first.pagesRendered).toBe(perBuilding);

    const second = await writeSite(model, DATA, out, { reuse });
    expect(second).toEqual({ pagesRendered: 0, pagesReused: perBuilding, bundleReused: true });

    // One building's page model changes (its name): that page is rendered, the rest copied.
    const changed = { ...model, buildings: model.buildings.map((b, i) => (i === 0 ? { ...b, title: `${b.title} (renamed)` } : b)) };
    const third = await writeSite(changed, DATA, out, { reuse });
    expect(third.pagesRendered).toBe(1);
    expect(third.pagesReused).toBe(perBuilding - 1);
    await writeSite(changed, DATA, join(work, "full"));
    expectSameTree(await tree(join(work, "full")), await tree(out));
  }, 120_000);

  it("a reused page is the published file itself (a hard link: same inode), not a copy read and written again", async () => {
    const reuse = { cacheDir: join(work, "cache3"), program: "test-program" };
    const out = join(work, "site3");
    const model = buildSiteModel(fixtureInput());
    await writeSite(model, DATA, out, { reuse });
    const page = join(out, model.buildings[0]!.path);
    const before = await stat(page);
    const again = await writeSite(model, DATA, out, { reuse });
    expect(again.pagesRendered).toBe(0);
    const after = await stat(page);
    expect(after.ino).toBe(before.ino);
    expect(after.mtimeMs).toBe(before.mtimeMs);
  }, 120_000);

  it("page models are plain JSON data, so their JSON text is a faithful key", () => {
    const model = buildSiteModel(fixtureInput());
    for (const page of [...model.buildings, ...model.meterBills, ...model.tenants, ...model.claims]) expect(JSON.parse(JSON.stringify(page))).toEqual(page);
  });

  it("renders again a published page that was edited by hand, or a different program's", async () => {
    const reuse = { cacheDir: join(work, "cache2"), program: "test-program" };
    const out = join(work, "site2");
    const model = buildSiteModel(fixtureInput());
    await writeSite(model, DATA, out, { reuse });
    const page = model.buildings[0]!.path;
    const original = await readFile(join(out, page));
    await writeFile(join(out, page), "edited by hand");
    const again = await writeSite(model, DATA, out, { reuse });
    expect(again.pagesRendered).toBe(1);
    expect((await readFile(join(out, page))).equals(original)).toBe(true);
    // A same-size edit (only the bytes differ) is caught too: the file's time changed, so it is read again.
    await writeFile(join(out, page), Buffer.from(original).fill(32, 0, 10));
    const sameSize = await writeSite(model, DATA, out, { reuse });
    expect(sameSize.pagesRendered).toBe(1);
    expect((await readFile(join(out, page))).equals(original)).toBe(true);
    const otherProgram = await writeSite(model, DATA, out, { reuse: { ...reuse, program: "another version" } });
    expect(otherProgram.pagesReused).toBe(0);
    expect(otherProgram.bundleReused).toBe(false);
  }, 120_000);

  it("reuses a building's pages whole, without making their view models, until an input they show changes; then writes what a full render writes", async () => {
    const reuse = { cacheDir: join(work, "cache-groups"), program: "test-program" };
    const out = join(work, "site-groups");
    const base = (): ReportInput => ({ ...withForecastMethod(fullFixtureInput()), disputes: disputeFixture() });
    // The view models made: pagesOfSlice is called once per building whose pages are made.
    let made: string[] = [];
    const counted = (input: ReportInput): SiteModelInParts => {
      const parts = siteModelInParts(input);
      return { ...parts, pagesOfSlice: (slice) => (made.push(slice.building.buildingId), parts.pagesOfSlice(slice)) };
    };
    await writeSite(counted(base()), DATA, out, { reuse });
    made = [];
    const again = await writeSite(counted(base()), DATA, out, { reuse });
    expect(made).toEqual([]);
    expect(again.pagesRendered).toBe(0);

    const b1 = (input: ReportInput) => input.portfolio.bills.find((b) => b.meterId === "E1")!;
    const changes: [string, (input: ReportInput) => void, string[]][] = [
      ["a bill's total", (i) => void (b1(i).total += 0.01), ["B1"]],
      ["a finding's message", (i) => void (i.findings!.find((f) => f.buildingId === "B1")!.message += " (again)"), ["B1"]],
      ["a priced bill's line", (i) => void (i.priced.get(b1(i).billId)!.computed!.total += 1), ["B1"]],
      ["an interval reading", (i) => void (i.portfolio.intervals.get("E1")!.values[5] = 123.25), ["B1"]],
      ["the forecast method's text", (i) => void (i.forecastMethod!.basisLabel = "the normals file"), ["B1", "B2"]],
      ["the currency", (i) => void (i.portfolio.settings.currency = "EUR"), ["B1", "B2"]],
      ["a data file of B1 (its size)", () => undefined, ["B1"]],
    ];
    for (const [what, change, buildings] of changes) {
      const input = base();
      change(input);
      const data = what.startsWith("a data file") ? { ...DATA, "buildings/B1/bills.csv": "bill_id\nE1-01\nE1-02\n" } : DATA;
      made = [];
      await writeSite(counted(input), data, out, { reuse });
      expect(made, what).toEqual(buildings);
      const full = join(work, `full-groups-${buildings.join("")}-${made.length}-${what.length}`);
      await writeSite(siteModelInParts(input), data, full);
      expectSameTree(await tree(full), await tree(out));
      // Back to the base for the next change (its pages made again once).
      await writeSite(counted(base()), DATA, out, { reuse });
    }
  }, 300_000);
});
