/**
 * A building's pages are made from its slice of the report input alone (buildingSlice.ts), and
 * the slice's content hash is the key a rebuild reuses them by. Two things must hold:
 * - the pages made from the slice are the pages made from the whole input (as they were made
 *   before slices existed: buildBuildingPage and friends given the whole input);
 * - any change to the input that changes a building's pages changes its slice's hash. Checked by
 *   changing, one at a time, leaves of every kind of field of a rich input (each number, string,
 *   boolean and typed-array kind, several instances of each) and comparing.
 */
import { describe, expect, it } from "vitest";
import type { ReportInput } from "../../src/report/input.ts";
import { siteModelInParts } from "../../src/report/buildSiteModel.ts";
import { buildBuildingPage, type BuildingContext } from "../../src/report/buildingPage.ts";
import { billLinesByBill, buildMeterBillsPage, meterAnalysis } from "../../src/report/meterBillsPage.ts";
import { buildTenantPage } from "../../src/report/tenantPage.ts";
import { canonicalFor } from "../../src/report/nav.ts";
import { effectiveAsOf } from "../../src/report/usageSummary.ts";
import { groupBy } from "../../src/core/groupBy.ts";
import { contentHash } from "../../src/core/contentHash.ts";
import { DEFAULT_HEAT_CONTENT_THERM_PER_CCF } from "../../src/core/units.ts";
import { fixtureInput, fullFixtureInput, manyBuildingsInput, withForecastMethod } from "./fixture.ts";
import { disputeFixture } from "./disputeFixture.ts";

/** Every building's pages made from the whole input, as siteModelInParts made them before slices. */
function pagesFromWholeInput(input: ReportInput): unknown[] {
  const { portfolio } = input;
  const { settings } = portfolio;
  const billsByMeter = groupBy(portfolio.bills, (b) => b.meterId);
  for (const list of billsByMeter.values()) list.sort((a, b) => (a.periodStart < b.periodStart ? -1 : a.periodStart > b.periodStart ? 1 : a.billId < b.billId ? -1 : 1));
  const asOf = effectiveAsOf(portfolio);
  const linesByBill = billLinesByBill(portfolio.billLines);
  const withCanonical = <T extends { path: string }>(page: T) => ({ ...page, canonical: canonicalFor(settings.basePath, page.path) });
  return portfolio.buildings.map((building) => {
    const ctx: BuildingContext = {
      building,
      meters: portfolio.meters.filter((m) => m.buildingId === building.buildingId),
      billsByMeter,
      asOf,
      heatContentOf: (m) => input.heatContentByMeter?.get(m.meterId) ?? DEFAULT_HEAT_CONTENT_THERM_PER_CCF,
      currency: settings.currency,
    };
    const analysis = meterAnalysis(input, ctx);
    return {
      buildings: [withCanonical(buildBuildingPage(input, ctx, analysis))],
      meterBills: ctx.meters.map((m) => withCanonical(buildMeterBillsPage(input, ctx, m, analysis, linesByBill))),
      tenants: building.tenantPage ? [withCanonical(buildTenantPage(building, ctx.meters, billsByMeter, input.baselines, settings.contacts?.[building.buildingId] ?? null))] : [],
    };
  });
}

function withTenantPages(input: ReportInput): ReportInput {
  return { ...input, portfolio: { ...input.portfolio, buildings: input.portfolio.buildings.map((b) => ({ ...b, tenantPage: true })) } };
}

/** The richest input: tenant pages, a forecast method and the hand-made disputes. */
function richInput(): ReportInput {
  return { ...withForecastMethod(withTenantPages(fullFixtureInput())), disputes: disputeFixture() };
}

const inputs: [string, () => ReportInput][] = [
  ["the small fixture", fixtureInput],
  ["the full fixture", fullFixtureInput],
  ["the full fixture with tenant pages, a forecast method and disputes", richInput],
  ["five buildings", () => manyBuildingsInput(5)],
];

describe("building slices", () => {
  it.each(inputs)("pages made from each slice equal the pages made from the whole input (%s)", (_name, make) => {
    const input = make();
    const parts = siteModelInParts(input);
    const fromSlices = Array.from({ length: parts.buildingCount }, (_, i) => parts.pagesOfSlice(parts.sliceOf(i)));
    expect(fromSlices).toEqual(pagesFromWholeInput(input));
    // pagesOf (what buildSiteModel uses) is the same slices' pages.
    const all = parts.pagesOf(0, parts.buildingCount);
    expect(all.buildings).toEqual(fromSlices.flatMap((p) => p.buildings));
  });

  it("each slice's lists are the whole input's rows of the building (its id, its meters, its bills), in order, as filtering them per building gives", () => {
    const input = richInput();
    const { portfolio } = input;
    // Rows that name two buildings: a finding of one building on another's meter, a dispute over both's bills.
    const [a, b] = portfolio.buildings;
    const meterOfB = portfolio.meters.find((m) => m.buildingId === b!.buildingId)!;
    const billOfB = portfolio.bills.find((x) => x.meterId === meterOfB.meterId)!;
    const findings = [...(input.findings ?? [])];
    findings.splice(1, 0, { ...findings[0]!, buildingId: a!.buildingId, meterId: meterOfB.meterId });
    findings.push({ ...findings[0]!, buildingId: "elsewhere", meterId: null, billId: billOfB.billId } as never);
    const disputes = (input.disputes ?? []).map((d, i) => (i === 0 ? { ...d, relatedBillIds: [...d.relatedBillIds, billOfB.billId] } : d));
    const crossed: ReportInput = { ...input, findings, disputes };
    const parts = siteModelInParts(crossed);
    const billsByMeter = groupBy(portfolio.bills, (x) => x.meterId);
    for (let i = 0; i < parts.buildingCount; i++) {
      const slice = parts.sliceOf(i);
      const id = slice.building.buildingId;
      const meterIds = new Set(portfolio.meters.filter((m) => m.buildingId === id).map((m) => m.meterId));
      const billIds = new Set([...meterIds].flatMap((m) => billsByMeter.get(m) ?? []).map((x) => x.billId));
      const ownMeter = (m: string | null | undefined) => m != null && meterIds.has(m);
      const ownBill = (x: string | null | undefined) => x != null && billIds.has(x);
      const own = slice.input;
      expect(slice.meters).toEqual(portfolio.meters.filter((m) => m.buildingId === id));
      expect(own.findings).toEqual(crossed.findings!.filter((f) => f.buildingId === id || ownMeter(f.meterId) || ownBill(f.billId)));
      expect(own.disputes).toEqual(crossed.disputes!.filter((d) => d.buildingId === id || ownMeter(d.meterId) || d.billIds.some(ownBill) || d.bills.some((x) => ownBill(x.billId)) || d.relatedBillIds.some(ownBill)));
      expect(own.models).toEqual(crossed.models?.filter((r) => ownMeter(r.meterId)));
      expect(own.baselines).toEqual(crossed.baselines?.filter((r) => ownMeter(r.meterId)));
      expect(own.trackRecord).toEqual(crossed.trackRecord?.filter((r) => ownMeter(r.meterId)));
      expect(own.forecast).toEqual(crossed.forecast?.filter((r) => r.buildingId === id || ownMeter(r.meterId)));
      expect(own.quality).toEqual(crossed.quality?.filter((r) => r.buildingId === id || ownMeter(r.meterId)));
      expect(own.trackRecordNotes).toEqual(crossed.trackRecordNotes?.filter((r) => r.buildingId === id || ownMeter(r.meterId)));
      expect(own.weatherDetections).toEqual(crossed.weatherDetections?.filter((w) => w.stationId === slice.building.weatherStation));
      expect(own.forecastTotals).toEqual(crossed.forecastTotals?.filter((t) => t.buildingId === id));
      expect(own.buildingForecasts).toEqual(crossed.buildingForecasts?.filter((t) => t.buildingId === id));
    }
    // The crossed rows are in both buildings' slices.
    expect(parts.sliceOf(0).input.findings).toContain(findings[1]);
    expect(parts.sliceOf(1).input.findings).toContain(findings[1]);
    expect(parts.sliceOf(1).input.findings).toContain(findings[findings.length - 1]);
    expect(parts.sliceOf(1).input.disputes).toContain(disputes[0]);
  });

  it("a slice is plain data (contentHash would skip a function, and read a class instance as its fields)", () => {
    const parts = siteModelInParts(richInput());
    const odd: string[] = [];
    const plain = new Set<unknown>([Object.prototype, Array.prototype, Map.prototype, Set.prototype, null]);
    const seen = new Set<unknown>();
    const walk = (v: unknown, path: string): void => {
      if (typeof v === "function" || typeof v === "symbol") odd.push(path);
      if (v === null || typeof v !== "object" || seen.has(v) || ArrayBuffer.isView(v)) return;
      seen.add(v);
      if (!plain.has(Object.getPrototypeOf(v))) odd.push(`${path} (a class instance)`);
      if (v instanceof Map) for (const [k, x] of v) walk(x, `${path}.get(${String(k)})`);
      else if (v instanceof Set) for (const x of v) walk(x, `${path} item`);
      else for (const [k, x] of Object.entries(v)) walk(x, `${path}.${k}`);
    };
    for (let i = 0; i < parts.buildingCount; i++) {
      const slice = parts.sliceOf(i);
      walk(slice, `slice[${i}]`);
    }
    expect(odd).toEqual([]);
  });

  it("any change to the input that changes a building's pages changes that building's slice hash", () => {
    const original = richInput();
    const leaves = leafPaths(original);
    // Several instances of every kind of leaf (same path with the indices and map keys left out).
    const byShape = new Map<string, Step[][]>();
    for (const path of leaves) {
      const shape = path.map((s) => (s.kind === "prop" ? s.key : s.kind)).join("/");
      const list = byShape.get(shape) ?? [];
      if (list.length < 2) list.push(path);
      byShape.set(shape, list);
    }
    const chosen = [...byShape.values()].flat();
    expect(chosen.length).toBeGreaterThan(150);
    const pagesBefore = pagesFromWholeInput(original).map((p) => JSON.stringify(p));
    const keysBefore = slicesHashes(original);
    let pagesChanged = 0;
    const stale: string[] = [];
    for (const path of chosen) {
      const changed = structuredClone(original);
      if (!mutate(changed, path)) continue;
      let pages: string[];
      let keys: string[];
      try {
        pages = pagesFromWholeInput(changed).map((p) => JSON.stringify(p));
        keys = slicesHashes(changed);
      } catch {
        continue; // an input the page builders refuse (e.g. a date that is no longer a date)
      }
      pages.forEach((p, i) => {
        if (p === pagesBefore[i]) return;
        pagesChanged++;
        if (keys[i] === keysBefore[i]) stale.push(`${pathText(path)} changes building ${i}'s pages, not its key`);
      });
    }
    expect(stale).toEqual([]);
    // The check has teeth: most changes show on some page.
    expect(pagesChanged).toBeGreaterThan(100);
  }, 120_000);

  it("a change the pages do not show, in another building or in the backtests' unrounded figures, leaves a building's key alone", () => {
    // A copy made by the serializer (as the analysis cache reads results back) keys as the original.
    const input = withForecastMethod(fullFixtureInput());
    const before = slicesHashes(structuredClone(input));
    const other = structuredClone(input);
    const b2 = other.portfolio.buildings[1]!.buildingId;
    const bill = other.portfolio.bills.find((b) => other.portfolio.meters.find((m) => m.meterId === b.meterId)!.buildingId === b2)!;
    bill.total += 1;
    const after = slicesHashes(other);
    expect(after[0]).toBe(before[0]);
    expect(after[1]).not.toBe(before[1]);
    const method = structuredClone(input);
    method.forecastMethod!.bases[0]!.meanAbsAnnualErrorPct += 1e-6;
    method.forecastMethod!.origins[0]!.modelAnnualErrorPct! += 1e-6;
    expect(slicesHashes(method)).toEqual(before);
  });
});

/** Each building's slice hashed as the page cache keys it (pageReuse.ts groupKeyOf). */
function slicesHashes(input: ReportInput): string[] {
  const parts = siteModelInParts(input);
  return Array.from({ length: parts.buildingCount }, (_, i) => contentHash(parts.sliceOf(i)));
}

type Step = { kind: "prop"; key: string } | { kind: "index"; index: number } | { kind: "map"; key: unknown } | { kind: "typed"; index: number };

/** Paths to every number, string and boolean of `value`, and one element of each typed array. */
function leafPaths(value: unknown): Step[][] {
  const out: Step[][] = [];
  const seen = new Set<unknown>();
  const walk = (v: unknown, path: Step[]): void => {
    if (typeof v === "number" || typeof v === "string" || typeof v === "boolean") {
      if (path.length > 0) out.push(path);
      return;
    }
    if (v === null || typeof v !== "object" || seen.has(v)) return;
    seen.add(v);
    if (ArrayBuffer.isView(v)) {
      const length = (v as unknown as { length: number }).length;
      if (length > 0) out.push([...path, { kind: "typed", index: Math.floor(length / 2) }]);
      return;
    }
    if (Array.isArray(v)) v.forEach((x, i) => walk(x, [...path, { kind: "index", index: i }]));
    else if (v instanceof Map) for (const [k, x] of v) walk(x, [...path, { kind: "map", key: k }]);
    else for (const [k, x] of Object.entries(v)) walk(x, [...path, { kind: "prop", key: k }]);
  };
  walk(value, []);
  return out;
}

/** Changes the leaf at `path` in place (a number by a non-round amount, a string by a suffix, a boolean flipped). */
function mutate(root: unknown, path: Step[]): boolean {
  let parent: unknown = root;
  for (const step of path.slice(0, -1)) parent = get(parent, step);
  const last = path[path.length - 1]!;
  if (last.kind === "typed") {
    const arr = parent as unknown as Record<number, number>;
    arr[last.index] = arr[last.index]! + 1.25;
    return true;
  }
  const v = get(parent, last);
  const next = typeof v === "number" ? v + 1.37 : typeof v === "string" ? `${v}x` : typeof v === "boolean" ? !v : undefined;
  if (next === undefined) return false;
  if (last.kind === "map") (parent as Map<unknown, unknown>).set(last.key, next);
  else (parent as Record<string | number, unknown>)[last.kind === "prop" ? last.key : last.index] = next;
  return true;
}

function get(v: unknown, step: Step): unknown {
  if (step.kind === "map") return (v as Map<unknown, unknown>).get(step.key);
  if (step.kind === "prop") return (v as Record<string, unknown>)[step.key];
  return (v as unknown[])[step.index];
}

function pathText(path: Step[]): string {
  return path.map((s) => (s.kind === "prop" ? `.${s.key}` : s.kind === "map" ? `.get(${String(s.key)})` : `[${s.index}]`)).join("");
}
