/**
 * plan-totals.ts against priceBill over invented tariffs: fast-check writes tariff files with
 * any mix of charges (fixed, blocks with and without day scaling, flat and time-of-use energy,
 * whole-period demand with ratchets and minimums on several windows, per-period demand, power
 * factor, percent lines of all or of named lines, minimum bills), labels that change kind or
 * disappear from one version to the next, and up to three versions inside one bill; each
 * price of a plan must give priceBill's total, billing demand and exactness (to the bit), and
 * throw what priceBill throws.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { priceBill } from "../../src/tariff/price.ts";
import { pricingPlan } from "../../src/tariff/plan.ts";
import { loadTariff } from "../../src/tariff/load.ts";
import type { PriceRequest } from "../../src/tariff/types.ts";

const LABELS = ["Alpha", "Beta", "Gamma", "Delta", "Epsilon", "Zeta"];
const ZONE = "America/New_York";

const rate = fc.double({ min: -0.05, max: 0.4, noNaN: true }).map((x) => Math.round(x * 1e4) / 1e4);
const positive = fc.double({ min: 0.5, max: 30, noNaN: true }).map((x) => Math.round(x * 100) / 100);

/** One charge's YAML body (after the label), given whether the version has periods. */
function chargeArb(tou: boolean): fc.Arbitrary<string> {
  const kinds: fc.Arbitrary<string>[] = [
    positive.map((a) => `fixed: ${a}`),
    fc.tuple(rate, rate, rate, fc.integer({ min: 1, max: 800 }), fc.integer({ min: 1, max: 5000 }), fc.boolean()).map(
      ([r1, r2, r3, a, b, scale]) => `blocks: [{ up_to: ${a}, rate: ${r1} }, { up_to: ${a + b}, rate: ${r2} }, { rate: ${r3} }]${scale ? ", scale_blocks_by_days: true" : ""}`,
    ),
    rate.map((r) => `energy: ${r}`),
    fc.tuple(positive, fc.constantFrom(5, 15, 30, 60), fc.option(fc.tuple(fc.integer({ min: 50, max: 100 }), fc.integer({ min: 1, max: 12 }))), fc.option(fc.integer({ min: 1, max: 400 }))).map(
      ([r, w, ratchet, min]) => `demand: ${r}, window_minutes: ${w}${ratchet ? `, ratchet: { percent: ${ratchet[0]}, months: ${ratchet[1]} }` : ""}${min !== null ? `, minimum_kw: ${min}` : ""}`,
    ),
    fc.double({ min: 0.8, max: 0.98, noNaN: true }).map((t) => `power_factor: { target: ${t.toFixed(2)} }`),
  ];
  if (tou) {
    kinds.push(fc.tuple(rate, rate).map(([a, b]) => `energy: { peak: ${a}, off: ${b} }`));
    kinds.push(fc.tuple(positive, fc.constantFrom(15, 30), fc.option(fc.integer({ min: 1, max: 300 }))).map(([r, w, min]) => `demand: { peak: ${r} }, window_minutes: ${w}${min !== null ? `, minimum_kw: ${min}` : ""}`));
  }
  return fc.oneof(...kinds);
}

const versionArb = fc.boolean().chain((tou) =>
  fc.record({
    tou: fc.constant(tou),
    charges: fc.uniqueArray(fc.tuple(fc.constantFrom(...LABELS), chargeArb(tou)), { minLength: 1, maxLength: 6, selector: ([l]) => l }),
    percent: fc.option(fc.tuple(fc.double({ min: 0.5, max: 9, noNaN: true }), fc.subarray(LABELS), fc.boolean(), fc.boolean())),
    minimumBill: fc.option(fc.integer({ min: 1, max: 3000 })),
  }),
);

interface VersionSpec {
  tou: boolean;
  charges: [string, string][];
  percent: [number, string[], boolean, boolean] | null;
  minimumBill: number | null;
}

function yamlOf(versions: VersionSpec[], froms: string[]): string {
  const out = ["id: plan-totals", "commodity: electricity", "usage_unit: kWh", "versions:"];
  versions.forEach((v, i) => {
    out.push(`  - from: ${froms[i]}`);
    if (v.tou) {
      out.push("    seasons: { summer: Jun-Sep, winter: Oct-May }", "    holidays: us-federal");
      out.push('    periods:\n      peak: { season: summer, days: weekdays, hours: "12:00-18:00" }\n      off: {}');
    }
    out.push("    charges:");
    const above: string[] = [];
    for (const [label, body] of v.charges) {
      out.push(`      - { label: ${label}, ${body} }`);
      above.push(label);
    }
    if (v.percent) {
      const [pct, of, all, withMin] = v.percent;
      const named = of.filter((l) => above.includes(l));
      if (withMin && v.minimumBill !== null) named.push("Minimum bill adjustment");
      const ofText = all || named.length === 0 ? "" : `, of: [${named.join(", ")}]`;
      out.push(`      - { label: Tax, percent: ${pct.toFixed(3)}${ofText} }`);
    }
    if (v.minimumBill !== null) out.push(`    minimum_bill: ${v.minimumBill}`);
  });
  return out.join("\n") + "\n";
}

/** 15-minute readings (kWh) from `start` local midnight for `days` days, with gaps when asked. */
function readings(start: string, days: number, scale: number, gaps: boolean) {
  const t0 = Date.parse(`${start}T05:00:00Z`);
  const n = days * 96;
  const keep = Array.from({ length: n }, (_, i) => !gaps || i % 97 !== 3);
  const idx = keep.flatMap((k, i) => (k ? [i] : []));
  return {
    startMs: Float64Array.from(idx, (i) => t0 + i * 900_000),
    values: Float64Array.from(idx, (i) => scale * (1 + Math.sin((i % 96) / 15) ** 2)),
    intervalMinutes: 15,
  };
}

function outcome(f: () => { total: number; billingDemandKw: number | null; exact: boolean }) {
  try {
    return f();
  } catch (error) {
    return { error: (error as Error).message };
  }
}

describe("plannedTotals (plan-totals.ts)", () => {
  it("gives priceBill's total, billing demand and exactness for any tariff", () => {
    fc.assert(
      fc.property(
        fc.array(versionArb, { minLength: 1, maxLength: 3 }),
        fc.integer({ min: 10, max: 40 }),
        fc.array(fc.double({ min: -50, max: 2e5, noNaN: true }), { minLength: 1, maxLength: 4 }),
        fc.option(fc.double({ min: 0, max: 900, noNaN: true })),
        fc.option(fc.double({ min: 0.5, max: 1, noNaN: true })),
        fc.array(fc.double({ min: 0, max: 900, noNaN: true }), { maxLength: 13 }),
        fc.constantFrom("none", "load-shape", "intervals", "gappy-intervals"),
        (versions, days, usages, demandKw, powerFactor, previousBillingDemandsKw, source) => {
          // Versions change inside the bill: 2024-06-10 + 9 days each.
          const froms = versions.map((_, i) => (i === 0 ? "2024-01-01" : `2024-06-${String(10 + 9 * i).padStart(2, "0")}`));
          const { tariff } = loadTariff(yamlOf(versions, froms), "t.yaml");
          fc.pre(tariff !== null); // about half are refused (a power-factor line with no demand above it)
          const start = "2024-06-05";
          const end = new Date(Date.parse(`${start}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
          const shape = source === "load-shape" ? Array.from({ length: 168 }, (_, h) => (h % 24 >= 10 && h % 24 < 19 ? 3 : 1)) : null;
          const fixed = { periodStart: start, periodEnd: end, timezone: ZONE, usageUnit: "kWh", powerFactor, loadShapeByHourOfWeek: shape };
          const plan = pricingPlan(tariff!, fixed);
          for (const usage of usages) {
            const intervals = source === "intervals" || source === "gappy-intervals" ? readings(start, days, Math.abs(usage) / 5000, source === "gappy-intervals") : null;
            const req: PriceRequest = { ...fixed, usage, demandKw, intervals, previousBillingDemandsKw };
            const expected = outcome(() => {
              const bill = priceBill(tariff!, req);
              return { total: bill.total, billingDemandKw: bill.billingDemandKw, exact: bill.exact };
            });
            expect(outcome(() => plan.price({ usage, demandKw, intervals, previousBillingDemandsKw }))).toStrictEqual(expected);
          }
        },
      ),
      { numRuns: 400 },
    );
  });
});
