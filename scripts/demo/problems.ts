/**
 * Planted billing problems: a documented handful of bills changed after clean pricing, each of
 * a kind the audit is meant to find. Everything not listed here stays clean.
 */
import type { ComputedBill, IntervalUsage, PriceRequest } from "../../src/tariff/types.ts";
import { addDays, daysBetween } from "./calendar.ts";
import type { DemoBill, MeterBills, PricedBill } from "./bills.ts";
import { withComputed } from "./bills.ts";
import { fixed, scaledIntText } from "./csv.ts";
import { readPeriod } from "./metering.ts";
import { loadDemoTariff, priceDemoBill } from "./pricing.ts";
import { harrowGsTouWithoutLastVersion } from "./tariffs.ts";

export interface PlantedProblem {
  buildingId: string;
  meterId: string;
  billIds: string[];
  /** Check codes the audit should raise (the first is the main one). */
  checks: string[];
  change: string;
  /** Signed money at stake (positive = billed too much); null when not a money error. */
  amountAtStakeUsd: number | null;
  note: string;
}

export interface PlantResult {
  bills: Map<string, DemoBill[]>;
  problems: PlantedProblem[];
}

function round2(x: number): number {
  return Math.round(x * 100 + Number.EPSILON * Math.sign(x)) / 100;
}

function indexByEndMonth(mb: MeterBills, month: string): number {
  const k = mb.priced.findIndex((p) => p.bill.periodEnd.startsWith(month));
  if (k < 0) throw new Error(`demo problems: ${mb.series.meter.meterId} has no bill ending in ${month}`);
  return k;
}

function reprice(mb: MeterBills, pb: PricedBill, request: PriceRequest): ComputedBill {
  return priceDemoBill(mb.tariff, request);
}

function scaledIntervals(iv: IntervalUsage, factor: number): IntervalUsage {
  return { ...iv, values: iv.values.map((v) => v * factor) };
}

/**
 * Applies every planted problem to copies of the clean bills and returns the bills to write
 * plus the list that data/demo/README.md documents.
 * @throws when a planted change would leak into other bills (e.g. through a ratchet)
 */
export function plantProblems(meters: Map<string, MeterBills>, buildingOfMeter: (id: string) => string): PlantResult {
  const bills = new Map<string, DemoBill[]>();
  for (const [id, mb] of meters) bills.set(id, mb.priced.map((p) => p.bill));
  const problems: PlantedProblem[] = [];
  const get = (id: string): MeterBills => {
    const mb = meters.get(id);
    if (!mb) throw new Error(`demo problems: unknown meter ${id}`);
    return mb;
  };
  const setBill = (id: string, k: number, bill: DemoBill) => {
    (bills.get(id) as DemoBill[])[k] = bill;
  };
  const add = (p: Omit<PlantedProblem, "buildingId">) => problems.push({ buildingId: buildingOfMeter(p.meterId), ...p });

  // 1. Old rate version after the 2025-07-01 change (large-service tariff).
  {
    const mb = get("TWR-E");
    const k = indexByEndMonth(mb, "2025-09");
    const pb = mb.priced[k];
    const old = priceDemoBill(loadDemoTariff(harrowGsTouWithoutLastVersion()), pb.request);
    setBill("TWR-E", k, withComputed(pb.bill, old));
    add({
      meterId: "TWR-E",
      billIds: [pb.bill.billId],
      checks: ["rate-suspect", "total-mismatch", "line-mismatch"],
      change: "priced entirely on the 2024-10-01 version although the 2025-07-01 version (lower energy rates and adjustment) was in force; printed lines are those of the old version",
      amountAtStakeUsd: round2(old.total - pb.computed.total),
      note: "",
    });
  }

  // 2. One printed line wrong: sales tax at 7.25 % instead of the tariff's 6.25 %.
  {
    const mb = get("MKT-E");
    const k = indexByEndMonth(mb, "2025-04");
    const bill = mb.priced[k].bill;
    const t = bill.lines.findIndex((l) => l.label === "Sales tax");
    if (t < 0) throw new Error("demo problems: MKT-E has no Sales tax line");
    const base = bill.lines.slice(0, t).reduce((s, l) => s + l.amount, 0);
    const wrongTax = round2(base * 0.0725);
    const delta = round2(wrongTax - bill.lines[t].amount);
    const lines = bill.lines.map((l, i) => (i === t ? { ...l, amount: wrongTax } : l));
    setBill("MKT-E", k, { ...bill, lines, total: round2(bill.total + delta) });
    add({
      meterId: "MKT-E",
      billIds: [bill.billId],
      checks: ["line-mismatch", "total-mismatch"],
      change: "the printed Sales tax line is computed at 7.25 % instead of 6.25 %; the total includes the difference",
      amountAtStakeUsd: delta,
      note: "",
    });
  }

  // 3. An unexplained extra printed line.
  {
    const mb = get("ASH-G");
    // A summer bill, so the fee is well above the audit's relative tolerance (0.5 % of the total).
    const k = indexByEndMonth(mb, "2024-08");
    const bill = mb.priced[k].bill;
    const fee = 42.75;
    setBill("ASH-G", k, { ...bill, lines: [...bill.lines, { label: "Meter access fee", amount: fee }], total: round2(bill.total + fee) });
    add({
      meterId: "ASH-G",
      billIds: [bill.billId],
      checks: ["unexplained-line", "total-mismatch"],
      change: "an extra printed line \"Meter access fee\" of 42.75 that no tariff charge explains, added to the total",
      amountAtStakeUsd: fee,
      note: "",
    });
  }

  // 4. Duplicate bill: the same period billed twice under a reissued statement number.
  {
    const mb = get("SCH-W");
    const k = indexByEndMonth(mb, "2024-06");
    const bill = mb.priced[k].bill;
    const dup: DemoBill = { ...bill, billId: `${bill.billId}-R`, statementDate: addDays(bill.statementDate, 21) };
    const list = bills.get("SCH-W") as DemoBill[];
    list.splice(k + 1, 0, dup);
    add({
      meterId: "SCH-W",
      billIds: [bill.billId, dup.billId],
      checks: ["duplicate-bill"],
      change: "a second row with the same period, usage and total (statement reissued three weeks later)",
      amountAtStakeUsd: bill.total,
      note: "",
    });
  }

  // 5. Overlapping period: a bill starting five days before the previous read.
  {
    const mb = get("CLN-E");
    const k = indexByEndMonth(mb, "2025-05");
    const pb = mb.priced[k];
    const start = addDays(pb.bill.periodStart, -5);
    const reading = readPeriod(mb.series, start, pb.bill.periodEnd);
    const request: PriceRequest = { ...pb.request, periodStart: start, usage: reading.usage, demandKw: reading.demandKw };
    const computed = reprice(mb, pb, request);
    setBill("CLN-E", k, withComputed({ ...pb.bill, periodStart: start, usage: reading.usage, usageText: reading.usageText, demandKw: reading.demandKw, demandText: reading.demandText }, computed));
    add({
      meterId: "CLN-E",
      billIds: [pb.bill.billId],
      checks: ["period-overlap"],
      change: `period_start moved back 5 days to ${start}, overlapping the previous bill; the 5 days' usage is billed again`,
      amountAtStakeUsd: round2(computed.total - pb.computed.total),
      note: "amount = this bill's total minus the total of its true (non-overlapping) period; prorating the bill by days gives a somewhat different figure",
    });
  }

  // 6. Gap: one bill missing.
  {
    const mb = get("LIB-E");
    const k = indexByEndMonth(mb, "2024-09");
    const bill = mb.priced[k].bill;
    (bills.get("LIB-E") as DemoBill[]).splice(k, 1);
    add({
      meterId: "LIB-E",
      billIds: [bill.billId],
      checks: ["period-gap"],
      change: `the bill for ${bill.periodStart} to ${bill.periodEnd} is missing (row removed)`,
      amountAtStakeUsd: null,
      note: `the missing bill would have been ${fixed(bill.total, 2)} USD`,
    });
  }

  // 7. Estimated-read streak of three with a true-up on the fourth bill.
  {
    const id = "CLN-G";
    const mb = get(id);
    const k0 = indexByEndMonth(mb, "2024-12");
    let estimatedSum = 0;
    let trueSum = 0;
    let delta = 0;
    const ids: string[] = [];
    for (let j = 0; j < 4; j++) {
      const pb = mb.priced[k0 + j];
      const lastYear = mb.priced[k0 + j - 12];
      trueSum += pb.bill.usage;
      let usage: number;
      if (j < 3) {
        const perDay = lastYear.bill.usage / daysBetween(lastYear.bill.periodStart, lastYear.bill.periodEnd);
        usage = Math.round(perDay * daysBetween(pb.bill.periodStart, pb.bill.periodEnd) * 0.9);
        estimatedSum += usage;
      } else {
        usage = trueSum - estimatedSum;
      }
      const computed = reprice(mb, pb, { ...pb.request, usage });
      delta += computed.total - pb.computed.total;
      setBill(id, k0 + j, withComputed({ ...pb.bill, usage, usageText: String(usage), readType: j < 3 ? "estimated" : "actual" }, computed));
      ids.push(pb.bill.billId);
    }
    add({
      meterId: id,
      billIds: ids,
      checks: ["estimated-read"],
      change: "three consecutive estimated reads (last year's use per day x 0.9), the fourth (actual) bill trues up the difference",
      amountAtStakeUsd: null,
      note: `not a money error by itself: the four bills together cost ${fixed(delta, 2)} USD more than if read every month (block pricing); the true-up bill may also look high against the weather model`,
    });
  }

  // 8. Multiplier error: billed usage and demand = metered x 2 for two bills.
  {
    const id = "WHS-E";
    const mb = get(id);
    const k0 = indexByEndMonth(mb, "2025-02");
    let delta = 0;
    const ids: string[] = [];
    const decimals = mb.series.meter.interval?.decimals ?? 0;
    for (let j = 0; j < 2; j++) {
      const pb = mb.priced[k0 + j];
      const iv = pb.request.intervals;
      if (!iv || pb.bill.demandKw === null) throw new Error("demo problems: WHS-E multiplier bill lacks interval data");
      const usage = pb.bill.usage * 2;
      const demandKw = pb.bill.demandKw * 2;
      const computed = reprice(mb, pb, { ...pb.request, usage, demandKw, intervals: scaledIntervals(iv, 2) });
      delta += computed.total - pb.computed.total;
      setBill(id, k0 + j, withComputed({
        ...pb.bill,
        usage,
        usageText: scaledIntText(Math.round(usage * 10 ** decimals), decimals),
        demandKw,
        demandText: fixed(demandKw, decimals),
      }, computed));
      ids.push(pb.bill.billId);
    }
    add({
      meterId: id,
      billIds: ids,
      checks: ["multiplier-suspect", "usage-vs-meter", "demand-vs-meter", "total-mismatch"],
      change: "billed usage and demand are exactly 2 x the interval data (utility applied multiplier 2 to a meter with multiplier 1)",
      amountAtStakeUsd: round2(delta),
      note: "",
    });
  }

  // 9. Billed demand above anything the interval meter recorded. The latest bill where the
  // inflated demand raises the billing demand (not hidden under the ratchet floor) and does not
  // leak into later ratchets is chosen, searching back from October 2025.
  {
    const id = "LAB-E";
    const mb = get(id);
    let k = indexByEndMonth(mb, "2025-11");
    let planted: { bill: DemoBill; computed: ComputedBill; demandKw: number } | null = null;
    for (; k >= 0 && mb.priced[k].request.intervals; k--) {
      const attempt = inflatePeak(mb, mb.priced[k], 0.14);
      if (attempt.computed.total > mb.priced[k].computed.total && ratchetUnaffected(mb, k, attempt.computed.billingDemandKw)) {
        planted = attempt;
        break;
      }
    }
    if (!planted) throw new Error("demo problems: no LAB-E bill fits the planted demand problem");
    const pb = mb.priced[k];
    setBill(id, k, planted.bill);
    add({
      meterId: id,
      billIds: [pb.bill.billId],
      checks: ["demand-vs-meter", "total-mismatch"],
      change: `printed demand ${fixed(planted.demandKw, 2)} kW is above the highest 15-minute demand in the interval data (${fixed(pb.bill.demandKw ?? 0, 2)} kW; one interval raised by 14 %); demand charges priced on it`,
      amountAtStakeUsd: round2(planted.computed.total - pb.computed.total),
      note: "",
    });
  }

  // 10. Billed usage above the interval sum (night-time energy that the meter never saw).
  {
    const id = "TWR-E";
    const mb = get(id);
    const k = indexByEndMonth(mb, "2025-05");
    const pb = mb.priced[k];
    const iv = pb.request.intervals;
    if (!iv || !mb.series.meter.interval) throw new Error("demo problems: TWR-E bill lacks interval data");
    const extraKwh = Math.round(pb.bill.usage * 0.045);
    const night: number[] = [];
    const i0 = mb.series.cal.dayIndex.get(pb.bill.periodStart) as number;
    const first = mb.series.cal.days[i0].firstInterval;
    for (let i = 0; i < iv.values.length; i++) if (mb.series.cal.clockMinute[first + i] < 300) night.push(i);
    const values = Float64Array.from(iv.values);
    for (const i of night) values[i] += extraKwh / night.length;
    const usage = pb.bill.usage + extraKwh;
    const decimals = mb.series.meter.interval.decimals;
    const computed = reprice(mb, pb, { ...pb.request, usage, intervals: { ...iv, values } });
    if (computed.billingDemandKw !== pb.computed.billingDemandKw) throw new Error("demo problems: TWR-E usage problem changed the billing demand");
    setBill(id, k, withComputed({ ...pb.bill, usage, usageText: scaledIntText(Math.round(usage * 10 ** decimals), decimals) }, computed));
    add({
      meterId: id,
      billIds: [pb.bill.billId],
      checks: ["usage-vs-meter", "total-mismatch"],
      change: `billed usage is ${extraKwh} kWh (4.5 %) above the interval sum x multiplier 40; the extra energy is priced as off-peak`,
      amountAtStakeUsd: round2(computed.total - pb.computed.total),
      note: "",
    });
  }

  // 11. A leak: two water bills far above the building's normal use.
  {
    const id = "ASH-W";
    const mb = get(id);
    const k0 = indexByEndMonth(mb, "2025-08");
    const leakCcf = [520, 610];
    let delta = 0;
    const ids: string[] = [];
    for (let j = 0; j < 2; j++) {
      const pb = mb.priced[k0 + j];
      const usage = pb.bill.usage + leakCcf[j];
      const computed = reprice(mb, pb, { ...pb.request, usage });
      delta += computed.total - pb.computed.total;
      setBill(id, k0 + j, withComputed({ ...pb.bill, usage, usageText: String(usage) }, computed));
      ids.push(pb.bill.billId);
    }
    add({
      meterId: id,
      billIds: ids,
      checks: ["usage-outlier"],
      change: `a leak adds ${leakCcf[0]} and ${leakCcf[1]} ccf to two consecutive bills (correctly priced)`,
      amountAtStakeUsd: null,
      note: `not a billing error: the leak cost ${fixed(delta, 2)} USD`,
    });
  }

  return { bills, problems };
}

/**
 * Raises the peak interval of a bill by `share` and lowers a neighbour in the same clock hour by
 * the same energy: the sum and time-of-use split stay, only the demand rises, as when a
 * utility misreads the demand register.
 */
function inflatePeak(mb: MeterBills, pb: PricedBill, share: number): { bill: DemoBill; computed: ComputedBill; demandKw: number } {
  const iv = pb.request.intervals as IntervalUsage;
  const values = Float64Array.from(iv.values);
  let m = 0;
  for (let i = 1; i < values.length; i++) if (values[i] > values[m]) m = i;
  const minute = Math.round(((iv.startMs[m] - iv.startMs[0]) / 60000) % 60);
  const n = minute === 45 ? m - 1 : m + 1;
  const bump = Math.round(values[m] * share * 100) / 100;
  values[m] += bump;
  values[n] -= bump;
  const demandKw = Math.round(values[m] * 4 * 100) / 100;
  const computed = priceDemoBill(mb.tariff, { ...pb.request, demandKw, intervals: { ...iv, values } });
  return { bill: withComputed({ ...pb.bill, demandKw, demandText: fixed(demandKw, 2) }, computed), computed, demandKw };
}

/** Whether later bills keep their totals when bill `k`'s billing demand is replaced in the ratchet history. */
function ratchetUnaffected(mb: MeterBills, k: number, plantedBillingKw: number | null): boolean {
  if (plantedBillingKw === null) return true;
  for (let j = k + 1; j < mb.priced.length; j++) {
    const pb = mb.priced[j];
    const history = [...(pb.request.previousBillingDemandsKw ?? [])];
    history[k] = plantedBillingKw;
    const again = priceDemoBill(mb.tariff, { ...pb.request, previousBillingDemandsKw: history });
    if (again.total !== pb.computed.total) return false;
  }
  return true;
}
