/**
 * Monthly totals of interval data by local calendar month: once over a finished series
 * ({@link monthlyTotals}) or on the fly while parsing ({@link MonthlyTotalsSink}).
 * Sums use Neumaier's compensated summation: a year of 15-minute readings is 35,040 terms.
 */
import type { IntervalSeries } from "../domain/types.ts";
import type { IntervalSink } from "./intervalStream.ts";
import { inferIntervalMinutes } from "./assembleIntervals.ts";
import { LocalMonthCalendar, type LocalMonth } from "../core/time/index.ts";

export interface MonthTotal {
  /** Local calendar month `YYYY-MM`. */
  month: string;
  /** Sum of values × multiplier over intervals starting in the month. */
  total: number;
  /** Intervals present. */
  intervals: number;
  /** Intervals the month holds at this length: real minutes in the local month / interval minutes (DST-aware). */
  expectedIntervals: number;
}

/**
 * Totals per local calendar month of `timezone`, every month from the first to the last
 * interval (months without data appear with 0 intervals). An interval belongs to the month
 * its start falls in. Example: 96 readings of 1 kWh on 2024-03-10 with multiplier 2 in
 * America/New_York → March total 192, expectedIntervals (31 × 24 − 1) × 4 = 2972.
 */
export function monthlyTotals(series: IntervalSeries, timezone: string, multiplier: number): MonthTotal[] {
  const n = series.startMs.length;
  if (n === 0) return [];
  const cal = new LocalMonthCalendar(timezone);
  const stepMs = series.intervalMinutes * 60000;
  const out: MonthTotal[] = [];
  let month = cal.monthOf(series.startMs[0]);
  let sum = 0;
  let comp = 0;
  let count = 0;
  const flush = (): void => {
    out.push({ month: month.month, total: (sum + comp) * multiplier, intervals: count,
      expectedIntervals: Math.round((month.endMs - month.startMs) / stepMs) });
    sum = 0;
    comp = 0;
    count = 0;
  };
  for (let k = 0; k < n; k++) {
    const t = series.startMs[k];
    while (t >= month.endMs) {
      flush();
      month = cal.next(month);
    }
    const v = series.values[k];
    const s = sum + v;
    comp += Math.abs(sum) >= Math.abs(v) ? sum - s + v : v - s + sum;
    sum = s;
    count++;
  }
  flush();
  return out;
}

interface MeterMonths {
  timezone: string;
  months: Map<string, { month: LocalMonth; sum: number; comp: number; count: number }>;
  /** Votes for 5/15/30/60-minute steps, to infer the interval length. */
  lastMs: number;
  steps: number[];
}

/**
 * Streaming form of {@link monthlyTotals} for {@link parseIntervalStream}: aggregates rows as
 * they are read, holding only one running sum per meter and month. Expects timestamps that
 * mark interval starts and no duplicates (it does not de-duplicate).
 */
export class MonthlyTotalsSink implements IntervalSink {
  private readonly meters: MeterMonths[] = [];
  private readonly ids: string[] = [];
  private readonly byId = new Map<string, number>();
  private readonly calendars = new Map<string, LocalMonthCalendar>();
  // Current month per meter, in flat arrays for the hot path.
  private curStart = new Float64Array(16);
  private curEnd = new Float64Array(16);
  private curSum = new Float64Array(16);
  private curComp = new Float64Array(16);
  private curCount = new Float64Array(16);
  private curMonth: (LocalMonth | null)[] = [];

  constructor(private readonly zoneOfMeter: (meterId: string) => string | null) {}

  meter(meterId: string): number {
    const known = this.byId.get(meterId);
    if (known !== undefined) return known;
    const i = this.meters.length;
    this.meters.push({ timezone: this.zoneOfMeter(meterId) ?? "UTC", months: new Map(), lastMs: Number.NaN, steps: [] });
    this.ids.push(meterId);
    this.byId.set(meterId, i);
    if (i >= this.curStart.length) {
      const grow = (a: Float64Array<ArrayBuffer>): Float64Array<ArrayBuffer> => {
        const b = new Float64Array(a.length * 2);
        b.set(a);
        return b;
      };
      this.curStart = grow(this.curStart);
      this.curEnd = grow(this.curEnd);
      this.curSum = grow(this.curSum);
      this.curComp = grow(this.curComp);
      this.curCount = grow(this.curCount);
    }
    this.curStart[i] = Number.POSITIVE_INFINITY;
    this.curEnd[i] = Number.NEGATIVE_INFINITY;
    this.curMonth.push(null);
    return i;
  }

  row(i: number, instantMs: number, value: number): void {
    if (!(instantMs >= this.curStart[i] && instantMs < this.curEnd[i])) this.switchMonth(i, instantMs);
    const sum = this.curSum[i];
    const s = sum + value;
    this.curComp[i] += Math.abs(sum) >= Math.abs(value) ? sum - s + value : value - s + sum;
    this.curSum[i] = s;
    this.curCount[i]++;
    const m = this.meters[i];
    if (m.steps.length < 64) {
      if (m.lastMs === m.lastMs) m.steps.push(instantMs - m.lastMs);
      m.lastMs = instantMs;
    }
  }

  private switchMonth(i: number, instantMs: number): void {
    this.flush(i);
    const m = this.meters[i];
    let cal = this.calendars.get(m.timezone);
    if (cal === undefined) {
      cal = new LocalMonthCalendar(m.timezone);
      this.calendars.set(m.timezone, cal);
    }
    const month = cal.monthOf(instantMs);
    this.curMonth[i] = month;
    this.curStart[i] = month.startMs;
    this.curEnd[i] = month.endMs;
  }

  private flush(i: number): void {
    const month = this.curMonth[i];
    if (month === null || this.curCount[i] === 0) return;
    const acc = this.meters[i].months.get(month.month) ?? { month, sum: 0, comp: 0, count: 0 };
    // Merge the running month into the stored one (rows may revisit a month when unsorted).
    const add = this.curSum[i] + this.curComp[i];
    const s = acc.sum + add;
    acc.comp += Math.abs(acc.sum) >= Math.abs(add) ? acc.sum - s + add : add - s + acc.sum;
    acc.sum = s;
    acc.count += this.curCount[i];
    this.meters[i].months.set(month.month, acc);
    this.curSum[i] = 0;
    this.curComp[i] = 0;
    this.curCount[i] = 0;
  }

  /** Totals per meter (months in calendar order), multiplier applied per meter. */
  result(multiplierOf: (meterId: string) => number = () => 1): Map<string, MonthTotal[]> {
    const out = new Map<string, MonthTotal[]>();
    for (let i = 0; i < this.meters.length; i++) {
      this.flush(i);
      const m = this.meters[i];
      const steps = [0, ...m.steps].map((_, k, a) => (k === 0 ? 0 : a.slice(1, k + 1).reduce((x, y) => x + y, 0)));
      const minutes = inferIntervalMinutes(steps) ?? 15;
      const mult = multiplierOf(this.ids[i]);
      const rows = [...m.months.values()]
        .sort((a, b) => a.month.startMs - b.month.startMs)
        .map((a) => ({
          month: a.month.month,
          total: (a.sum + a.comp) * mult,
          intervals: a.count,
          expectedIntervals: Math.round((a.month.endMs - a.month.startMs) / (minutes * 60000)),
        }));
      out.set(this.ids[i], rows);
    }
    return out;
  }
}
