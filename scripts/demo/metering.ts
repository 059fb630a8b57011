/**
 * What each meter "really" measured: simulated consumption turned into meter readings in the
 * meter's unit, exactly as the files state them. Interval meters keep integer counts of the
 * file's last decimal so that bills equal interval sums to the last digit.
 */
import type { ZoneCalendar } from "./calendar.ts";
import type { IntervalUsage } from "../../src/tariff/types.ts";
import { scaledIntText } from "./csv.ts";
import type { MeterDef } from "./definition.ts";

/** Gas heat content used by the invented utility to convert ccf to therms. */
export const HEAT_CONTENT_THERM_PER_CCF = 1.041;
/** 1 ccf = 748.052 U.S. gallons (100 ft³ × 7.48052 gal/ft³). */
export const GAL_PER_CCF = 748.052;

export interface MeterSeries {
  meter: MeterDef;
  cal: ZoneCalendar;
  /** Electricity: simulated kWh per 15-minute interval. */
  kwh: Float64Array | null;
  /** Interval meters: value in the file per interval, as an integer count of 10^-decimals units (before multiplier). */
  counts: Int32Array | null;
  /** Gas (therm) or water (gal) per local day. */
  daily: Float64Array | null;
}

/** Metered quantities of one service period. */
export interface PeriodReading {
  usage: number;
  /** Exact text written in bills.csv. */
  usageText: string;
  demandKw: number | null;
  demandText: string | null;
}

/** [first, end) interval indices of the half-open local period [start, end). */
export function intervalRange(cal: ZoneCalendar, periodStart: string, periodEnd: string): [number, number] {
  const a = cal.dayIndex.get(periodStart);
  const b = cal.dayIndex.get(periodEnd);
  if (a === undefined) throw new Error(`demo: period start ${periodStart} outside the calendar`);
  const first = cal.days[a].firstInterval;
  const end = b === undefined ? cal.startMs.length : cal.days[b].firstInterval;
  return [first, end];
}

/** [first, end) day indices of the half-open local period. */
export function dayRange(cal: ZoneCalendar, periodStart: string, periodEnd: string): [number, number] {
  const a = cal.dayIndex.get(periodStart);
  const b = cal.dayIndex.get(periodEnd) ?? cal.days.length;
  if (a === undefined) throw new Error(`demo: period start ${periodStart} outside the calendar`);
  return [a, b];
}

/** Integer counts of the file's last decimal for an interval meter's values. */
export function intervalCounts(kwh: Float64Array, multiplier: number, decimals: number): Int32Array {
  const scale = 10 ** decimals;
  const out = new Int32Array(kwh.length);
  for (let i = 0; i < kwh.length; i++) out[i] = Math.round((kwh[i] / multiplier) * scale);
  return out;
}

/**
 * Billed usage and measured demand for a period.
 * Interval meters: usage = Σ values × multiplier, demand = max value × multiplier × 4 (kW of a
 * 15-minute interval); others are rounded to whole units, demand to 0.1 kW.
 */
export function readPeriod(series: MeterSeries, periodStart: string, periodEnd: string): PeriodReading {
  const { meter, cal } = series;
  if (series.counts && meter.interval) {
    const [i0, i1] = intervalRange(cal, periodStart, periodEnd);
    let sum = 0;
    let max = 0;
    for (let i = i0; i < i1; i++) {
      sum += series.counts[i];
      if (series.counts[i] > max) max = series.counts[i];
    }
    const d = meter.interval.decimals;
    const usageCount = sum * meter.multiplier;
    const demandCount = max * meter.multiplier * 4;
    return {
      usage: usageCount / 10 ** d,
      usageText: scaledIntText(usageCount, d),
      demandKw: demandCount / 10 ** d,
      demandText: scaledIntText(demandCount, d),
    };
  }
  if (series.kwh) {
    const [i0, i1] = intervalRange(cal, periodStart, periodEnd);
    let sum = 0;
    let max = 0;
    for (let i = i0; i < i1; i++) {
      sum += series.kwh[i];
      if (series.kwh[i] > max) max = series.kwh[i];
    }
    const usage = Math.round(sum);
    const demand = Math.round(max * 4 * 10) / 10;
    return { usage, usageText: String(usage), demandKw: demand, demandText: demand.toFixed(1) };
  }
  if (!series.daily) throw new Error(`demo: meter ${meter.meterId} has no simulated series`);
  const [d0, d1] = dayRange(cal, periodStart, periodEnd);
  let sum = 0;
  for (let d = d0; d < d1; d++) sum += series.daily[d];
  const usage = Math.round(convertDaily(meter, sum));
  return { usage, usageText: String(usage), demandKw: null, demandText: null };
}

/** Converts simulated therms or gallons to the meter's unit. */
export function convertDaily(meter: MeterDef, amount: number): number {
  if (meter.commodity === "gas") return meter.unit === "ccf" ? amount / HEAT_CONTENT_THERM_PER_CCF : amount;
  return meter.unit === "ccf" ? amount / GAL_PER_CCF : amount;
}

/** Interval usage of a period for the tariff engine: multiplier applied, in kWh. */
export function periodIntervals(series: MeterSeries, periodStart: string, periodEnd: string): IntervalUsage {
  if (!series.counts || !series.meter.interval) throw new Error(`demo: ${series.meter.meterId} has no interval data`);
  const [i0, i1] = intervalRange(series.cal, periodStart, periodEnd);
  const scale = series.meter.multiplier / 10 ** series.meter.interval.decimals;
  const values = new Float64Array(i1 - i0);
  for (let i = i0; i < i1; i++) values[i - i0] = series.counts[i] * scale;
  return { startMs: series.cal.startMs.slice(i0, i1), values, intervalMinutes: 15 };
}
