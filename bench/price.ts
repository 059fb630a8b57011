/**
 * Benchmark: price one month of 15-minute interval data on a time-of-use + demand tariff,
 * many times. Run with `npx tsx bench/price.ts [iterations]`.
 * Prints bills per second and the implied time to re-price 100,000 bills. Data are invented.
 */
import { performance } from "node:perf_hooks";
import { loadTariff } from "../src/tariff/load.ts";
import { priceBill } from "../src/tariff/price.ts";
import type { PriceRequest } from "../src/tariff/types.ts";

const TARIFF = `
id: bench-tou-demand
name: Larkspur Valley Power large general service (benchmark)
commodity: electricity
usage_unit: kWh
versions:
  - from: 2024-01-01
    seasons: { summer: Jun-Sep, winter: Oct-May }
    holidays: us-federal
    periods:
      peak: { season: summer, days: weekdays, hours: "14:00-19:00" }
      shoulder: { days: weekdays, hours: ["08:00-14:00", "19:00-22:00"] }
      off-peak: {}
    charges:
      - { label: Customer charge, fixed: 24.50 }
      - label: Delivery
        blocks: [{ up_to: 5000, rate: 0.061 }, { up_to: 20000, rate: 0.052 }, { rate: 0.044 }]
      - { label: Energy, energy: { peak: 0.238, shoulder: 0.161, off-peak: 0.097 } }
      - { label: Fuel cost adjustment, energy: 0.0125 }
      - { label: Facility demand, demand: 13.80, window_minutes: 30, ratchet: { percent: 80, months: 11 }, minimum_kw: 10 }
      - { label: Peak demand, demand: { peak: 8.25, shoulder: 2.10 } }
      - { label: Power factor adjustment, power_factor: { target: 0.90 } }
      - { label: Sales tax, percent: 7.25 }
    minimum_bill: 40.00
`;

const { tariff, issues } = loadTariff(TARIFF, "bench.yaml");
if (!tariff) throw new Error(issues.map((i) => i.message).join("; "));

// July 2025 in America/Chicago: 31 days × 96 = 2,976 intervals from local midnight (05:00Z, CDT).
const zone = "America/Chicago";
const n = 31 * 96;
const t0 = Date.parse("2025-07-01T05:00:00Z");
const startMs = new Float64Array(n);
const values = new Float64Array(n);
let seed = 42;
const rand = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
for (let i = 0; i < n; i++) {
  startMs[i] = t0 + i * 900_000;
  const hour = Math.floor((i % 96) / 4);
  values[i] = 20 + (hour >= 8 && hour < 20 ? 35 : 0) + rand() * 10; // kWh per 15 minutes
}
const usage = values.reduce((a, b) => a + b, 0);
const req: PriceRequest = {
  periodStart: "2025-07-01",
  periodEnd: "2025-08-01",
  timezone: zone,
  usage,
  usageUnit: "kWh",
  powerFactor: 0.86,
  previousBillingDemandsKw: [260, 250, 240, 230, 270, 280, 300, 310, 290, 275, 265],
  intervals: { startMs, values, intervalMinutes: 15 },
};

const iterations = Number(process.argv[2] ?? 2000);
const rounds = 5;
for (let i = 0; i < 200; i++) priceBill(tariff, req); // warm-up (JIT, holiday cache, period table, zone offsets)
// Several rounds, best and median reported: other processes on a shared machine slow some rounds.
const perBill: number[] = [];
let checksum = 0;
for (let r = 0; r < rounds; r++) {
  const t = performance.now();
  for (let i = 0; i < iterations; i++) checksum += priceBill(tariff, req).total;
  perBill.push((performance.now() - t) / iterations);
}
perBill.sort((a, b) => a - b);
const best = perBill[0];
const median = perBill[Math.floor(rounds / 2)];
const bill = priceBill(tariff, req);
console.log("tariff: TOU (3 periods, seasons, us-federal holidays) + blocks + 30-min demand with ratchet + period demand + PF + tax");
console.log(`intervals per bill: ${n} (15-minute, one month)`);
console.log(`bill total: ${bill.total.toFixed(2)} (${bill.exact ? "exact" : "not exact"}); checksum ${checksum.toFixed(2)}`);
console.log(`${rounds} rounds × ${iterations} bills: best ${best.toFixed(3)} ms/bill (${Math.round(1000 / best)} bills/s), median ${median.toFixed(3)} ms/bill (${Math.round(1000 / median)} bills/s)`);
console.log(`implied time for 100,000 bills: ${((best * 100_000) / 1000).toFixed(1)} s best, ${((median * 100_000) / 1000).toFixed(1)} s median (single thread)`);
