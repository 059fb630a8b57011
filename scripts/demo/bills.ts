/**
 * Clean bills for one meter: read dates → metered usage and demand → priced by the tariff
 * engine, in order, so ratchets see the billing demand of the bills before.
 */
import type { ComputedBill, PriceRequest } from "../../src/tariff/types.ts";
import { addDays } from "./calendar.ts";
import { INTERVAL_ERA_START } from "./definition.ts";
import type { MeterSeries } from "./metering.ts";
import { periodIntervals, readPeriod } from "./metering.ts";
import type { DemoTariff } from "./pricing.ts";
import { priceDemoBill } from "./pricing.ts";
import { Rng } from "./prng.ts";

export interface DemoBill {
  meterId: string;
  billId: string;
  periodStart: string;
  periodEnd: string;
  usage: number;
  usageText: string;
  readType: "actual" | "estimated";
  demandKw: number | null;
  demandText: string | null;
  powerFactor: number | null;
  total: number;
  statementDate: string;
  /** Printed lines (label, amount); written to bill_lines.csv for meters that print them. */
  lines: { label: string; amount: number }[];
}

/** A bill together with how it was priced, so planted problems can re-price variants. */
export interface PricedBill {
  bill: DemoBill;
  request: PriceRequest;
  computed: ComputedBill;
}

export interface MeterBills {
  series: MeterSeries;
  tariff: DemoTariff;
  priced: PricedBill[];
  /** First read date of the interval data written for this meter (interval meters only). */
  intervalFrom: string | null;
  intervalTo: string | null;
}

/** Bill id as printed on the (invented) statements: meter id + month of the closing read. */
export function billIdFor(meterId: string, periodEnd: string): string {
  return `${meterId}-${periodEnd.slice(0, 7)}`;
}

/** Converts an engine result to the printed bill fields. */
export function withComputed(bill: DemoBill, computed: ComputedBill): DemoBill {
  return { ...bill, total: computed.total, lines: computed.lines.map((l) => ({ label: l.label, amount: l.amount })) };
}

/**
 * Builds and prices the clean bills of one meter from its read dates.
 * Interval meters price with interval data from the bill that contains INTERVAL_ERA_START on.
 */
export function buildMeterBills(series: MeterSeries, tariff: DemoTariff, reads: string[]): MeterBills {
  const { meter, cal } = series;
  const rng = Rng.forKey(`bills:${meter.meterId}`);
  const priced: PricedBill[] = [];
  const history: number[] = [];
  let intervalFrom: string | null = null;
  for (let k = 0; k + 1 < reads.length; k++) {
    const periodStart = reads[k];
    const periodEnd = reads[k + 1];
    const reading = readPeriod(series, periodStart, periodEnd);
    const powerFactor = meter.printsPowerFactor ? Math.round(rng.uniform(0.86, 0.975) * 100) / 100 : null;
    const useIntervals = meter.interval !== undefined && periodEnd > INTERVAL_ERA_START;
    if (useIntervals && intervalFrom === null) intervalFrom = periodStart;
    const request: PriceRequest = {
      periodStart,
      periodEnd,
      timezone: cal.zone,
      usage: reading.usage,
      usageUnit: meter.unit,
      demandKw: reading.demandKw,
      powerFactor,
      intervals: useIntervals ? periodIntervals(series, periodStart, periodEnd) : null,
      previousBillingDemandsKw: [...history],
    };
    const computed = priceDemoBill(tariff, request);
    if (computed.billingDemandKw !== null) history.push(computed.billingDemandKw);
    const bill: DemoBill = withComputed(
      {
        meterId: meter.meterId,
        billId: billIdFor(meter.meterId, periodEnd),
        periodStart,
        periodEnd,
        usage: reading.usage,
        usageText: reading.usageText,
        readType: "actual",
        demandKw: meter.printsDemand ? reading.demandKw : null,
        demandText: meter.printsDemand ? reading.demandText : null,
        powerFactor,
        total: 0,
        statementDate: addDays(periodEnd, rng.int(2, 6)),
        lines: [],
      },
      computed,
    );
    priced.push({ bill, request, computed });
  }
  const intervalTo = intervalFrom === null ? null : reads[reads.length - 1];
  return { series, tariff, priced, intervalFrom, intervalTo };
}
