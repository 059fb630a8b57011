/**
 * Flagged readings never drive money (issue 12, item 6). The demo portfolio (invented, seeded)
 * gets five planted 25× spikes on meter TWR-E: three inside TWR-E-2025-05 (whose billed usage
 * the generator raised by 4.5 %, amount 1,381.20 USD in data/demo/README.md) and two inside the
 * clean bill TWR-E-2025-03. Source of the expectations: the generator's record of the planted
 * billing problem, and the definition of the spikes themselves (each reading × 25).
 */
import { describe, expect, it } from "vitest";
import { loadPortfolio } from "../../src/ingest/index.ts";
import { assessIntervalMeters } from "../../src/clean/assessMeters.ts";
import { analyseBuilding } from "../../src/pipeline/build.ts";
import { meteredViewsByBill } from "../../src/audit/meteredViews.ts";
import type { Portfolio } from "../../src/domain/types.ts";
import type { Tariff } from "../../src/tariff/index.ts";
import { localMidnightMs } from "../../src/core/time/index.ts";
import { lowerBound } from "../../src/core/sorted.ts";

const ZONE = "America/New_York";

describe("five planted 25× spikes on TWR-E", async () => {
  const loaded = await loadPortfolio("data/demo");
  const demo = loaded.portfolio!;
  const original = demo.intervals.get("TWR-E")!;
  const values = Float64Array.from(original.values);
  // Weekday mid-afternoons and one night, inside the two bills' local periods.
  const plantedAt = ["2025-04-15T14:00", "2025-04-23T03:00", "2025-05-01T15:30", "2025-02-19T13:00", "2025-03-04T11:45"].map((local) => {
    const [day, time] = local.split("T") as [string, string];
    const [h, m] = time.split(":").map(Number) as [number, number];
    const ms = localMidnightMs(day, ZONE) + (h * 60 + m) * 60_000;
    const i = lowerBound(original.startMs, ms);
    expect(original.startMs[i]).toBe(ms);
    values[i] = values[i]! * 25;
    return i;
  });
  const spiked: Portfolio = { ...demo, intervals: new Map(demo.intervals).set("TWR-E", { ...original, values }) };
  const quality = assessIntervalMeters(spiked);
  const q = quality.meters.find((m) => m.meterId === "TWR-E")!;
  const masks = new Map(quality.meters.map((m) => [m.meterId, m.mask]));
  const building = spiked.buildings.find((b) => b.buildingId === "quill-tower")!;
  const result = analyseBuilding(quality.portfolio as Portfolio<Tariff>, building, masks);
  const clean = analyseBuilding(demo as Portfolio<Tariff>, building, new Map());
  const unmasked = analyseBuilding(quality.portfolio as Portfolio<Tariff>, building, new Map());
  const twr = result.findings.filter((f) => f.meterId === "TWR-E" && f.severity !== "info");

  it("flags each spike", () => {
    expect(q.appliedOffsetHours).toBe(0);
    for (const i of plantedAt) {
      expect(q.mask[i], new Date(original.startMs[i]!).toISOString()).toBe(1);
      const d = q.detections.find((x) => x.startMs <= original.startMs[i]! && original.startMs[i]! < x.endMs);
      expect(d?.kind).toBe("spike");
    }
  });

  it("raises no usage or demand finding on the clean bill that holds two spikes", () => {
    expect(twr.filter((f) => f.billId === "TWR-E-2025-03" || (f.relatedBillIds ?? []).includes("TWR-E-2025-03"))).toEqual([]);
  });

  it("still finds the planted usage error with its amount, showing raw and cleaned readings", () => {
    const f = twr.find((x) => x.check === "usage-vs-meter" && x.billId === "TWR-E-2025-05");
    expect(f, JSON.stringify(twr.map((x) => [x.check, x.billId, x.amountAtStake]))).toBeDefined();
    // within 1 % of the generator's amount (the acceptance tolerance of the demo audit test)
    expect(Math.abs(f!.amountAtStake! - 1381.2)).toBeLessThanOrEqual(1381.2 * 0.01);
    const labels = f!.evidence.rows.map((r) => r.label);
    expect(labels.some((l) => /flagged readings left out/.test(l))).toBe(true);
    expect(labels.some((l) => /raw readings incl\. 3 flagged/.test(l))).toBe(true);
    const raw = f!.evidence.rows.find((r) => /raw readings/.test(r.label))!;
    const cleaned = f!.evidence.rows.find((r) => /left out/.test(r.label))!;
    // The raw sum is larger by the spikes: 24 × the three planted readings × multiplier 40 (to rounding).
    const extra = [0, 1, 2].reduce((s, k) => s + 24 * original.values[plantedAt[k]!]! * 40, 0);
    expect(Number(raw.expected) - Number(cleaned.expected)).toBeGreaterThan(0.95 * extra);
    expect(f!.evidence.notes.join(" ")).toMatch(/No amount rests on them/);
  });

  it("no money figure of the building rests on a flagged reading: metered recomputations match the clean meter", () => {
    for (const id of ["TWR-E-2025-03", "TWR-E-2025-05"]) {
      const a = result.priced.get(id)!;
      const b = clean.priced.get(id)!;
      // the bill priced on its billed quantities is exactly what it is without the masks
      expect(a.computed).toEqual(unmasked.priced.get(id)!.computed);
      // metered usage from the cleaned readings is within 0.1 % of the unspiked meter's (three or
      // two quarter-hours of about 2,900 are scaled over by coverage)
      expect(Math.abs(a.meteredUsage! - b.meteredUsage!) / b.meteredUsage!).toBeLessThan(0.001);
      expect(a.meteredDemandKw).toBeLessThanOrEqual(b.meteredDemandKw! + 1e-9);
    }
    for (const f of result.findings) {
      if (f.amountAtStake === null) continue;
      expect(Math.abs(f.amountAtStake), `${f.check} ${f.billId}`).toBeLessThan(5000);
    }
  });

  it("bills-recomputed views give raw and cleaned sums side by side", () => {
    const views = meteredViewsByBill(quality.portfolio, masks);
    const v = views.get("TWR-E-2025-03")!;
    expect(v.flaggedIntervals).toBeGreaterThanOrEqual(2);
    expect(v.raw).toBeGreaterThan(v.cleaned);
  });
});
