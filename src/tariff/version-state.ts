/**
 * Work shared by the charges of one tariff version on one bill: period index of every interval,
 * and the split of usage by period (exact from interval data, else estimated from a load shape
 * or by hours). Computed lazily, once.
 */
import type { LineStatus } from "./types.ts";
import type { TariffVersion } from "./model.ts";
import type { BillContext } from "./context.ts";
import { periodIndices } from "./calendar.ts";
import { maxWindowDemandByPeriodKw, maxWindowDemandKw, maxWindowDemandsKw, type WindowDemand } from "./demand.ts";
import { groupedNumber } from "./format.ts";
import { sumAmounts } from "../core/money.ts";

const fmt = groupedNumber;

/** Shares of usage by period, with how they were obtained. */
export interface PeriodSplit {
  /** Usage per period index, in the tariff unit. */
  usage: number[];
  total: number;
  status: LineStatus;
  note: string | null;
}

/**
 * Whether two figures of the same quantity agree within the rounding of a printed figure
 * (0.05 % of the larger, or 0.01 absolute for small ones): a bill prints usage and demand
 * rounded, so a metered 1,154.431 kW and a printed 1,154.4 kW are the same reading.
 */
export function agreesWithinRounding(a: number, b: number): boolean {
  return Math.abs(a - b) <= Math.max(0.01, 0.0005 * Math.max(Math.abs(a), Math.abs(b)));
}

/*
 * Runs of equal period index ([period, first, end) triples), per period-index array: they
 * depend on the instants and the version only, and a forecast splits the same month's instants
 * once per scenario. Kept as long as the index array (calendar.ts caches that per instants).
 */
const runsByIndices = new WeakMap<Int8Array, Int32Array>();

function periodRuns(idx: Int8Array): Int32Array {
  let runs = runsByIndices.get(idx);
  if (runs === undefined) {
    const out: number[] = [];
    for (let i = 0; i < idx.length; ) {
      let j = i + 1;
      while (j < idx.length && idx[j] === idx[i]) j++;
      out.push(idx[i]!, i, j);
      i = j;
    }
    runsByIndices.set(idx, (runs = Int32Array.from(out)));
  }
  return runs;
}

/**
 * Usage per period: `sums[idx[i]] += usage[i]` in interval order (an index outside the periods
 * adds nothing), the same additions in the same order, but each run of one period is added in
 * a local sum instead of through memory, which does not wait on a store per interval.
 * @example usageByPeriod(Float64Array.of(1, 2, 4), Int8Array.of(0, 0, 1), 2) // Float64Array [3, 4]
 */
export function usageByPeriod(usage: Float64Array, idx: Int8Array, periodCount: number): Float64Array {
  const sums = new Float64Array(periodCount);
  const runs = periodRuns(idx);
  for (let r = 0; r < runs.length; r += 3) {
    const p = runs[r]!;
    if (p < 0 || p >= periodCount) continue;
    const end = runs[r + 2]!;
    let acc = sums[p]!;
    for (let i = runs[r + 1]!; i < end; i++) acc += usage[i]!;
    sums[p] = acc;
  }
  return sums;
}

/** Per-version cache of work shared by several charges. */
export class VersionState {
  private periodIdx: Int8Array | null = null;
  private hourlyIdx: Int8Array | null = null;
  private split: PeriodSplit | null = null;
  private demands: Map<number, { whole: WindowDemand | null; byPeriod: (number | null)[] | null }> | null = null;
  constructor(
    readonly ctx: BillContext,
    readonly version: TariffVersion,
  ) {}

  intervalPeriods(): Int8Array {
    if (this.periodIdx === null) this.periodIdx = periodIndices(this.ctx.intervals!.local, this.version);
    return this.periodIdx;
  }

  /** Highest window average over the whole period from the interval data (kW), per window length. */
  windowDemand(windowMinutes: number): WindowDemand {
    const d = this.windowDemands(windowMinutes);
    if (d.whole === null) {
      const iv = this.ctx.intervals!;
      d.whole = maxWindowDemandKw(iv.startMs, iv.kwh!, iv.intervalMinutes, windowMinutes);
    }
    return d.whole;
  }

  /** Highest window average inside each period from the interval data (kW), per window length. */
  windowDemandByPeriod(windowMinutes: number): (number | null)[] {
    const d = this.windowDemands(windowMinutes);
    if (d.byPeriod === null) {
      const iv = this.ctx.intervals!;
      d.byPeriod = maxWindowDemandByPeriodKw(iv.startMs, iv.kwh!, iv.intervalMinutes, windowMinutes, this.intervalPeriods(), this.version.periods.length);
    }
    return d.byPeriod;
  }

  /**
   * The demands of one window length. When the version has both a whole-period and a per-period
   * demand charge on that window, both are found in one pass over the readings (the same numbers
   * as two passes: maxWindowDemandsKw).
   */
  private windowDemands(windowMinutes: number): { whole: WindowDemand | null; byPeriod: (number | null)[] | null } {
    this.demands ??= new Map();
    let d = this.demands.get(windowMinutes);
    if (d === undefined) {
      d = { whole: null, byPeriod: null };
      let flat = false;
      let periods = false;
      for (const c of this.version.charges) {
        if (c.kind !== "demand" || c.windowMinutes !== windowMinutes) continue;
        if ("flat" in c.rate) flat = true;
        else periods = true;
      }
      if (flat && periods) {
        const iv = this.ctx.intervals!;
        const both = maxWindowDemandsKw(iv.startMs, iv.kwh!, iv.intervalMinutes, windowMinutes, this.intervalPeriods(), this.version.periods.length);
        d.whole = both.whole;
        d.byPeriod = both.byPeriod;
      }
      this.demands.set(windowMinutes, d);
    }
    return d;
  }

  hourlyPeriods(): Int8Array {
    if (this.hourlyIdx === null) this.hourlyIdx = periodIndices(this.ctx.hourly().local, this.version);
    return this.hourlyIdx;
  }

  /** Weight of each hour of the period: the load shape when known, else 1 (split by hours). Not to be mutated. */
  hourWeights(): Float64Array {
    return this.ctx.frame.hourWeights();
  }

  /** Whether the bill has a load shape with some use (the frame's request carries the same shape). */
  hasShape(): boolean {
    return this.ctx.frame.hasShape();
  }

  /** Share of each period in the hours' weights: usage-independent, so kept on the frame per version. */
  private hourlyShares(): number[] {
    const cached = this.ctx.frame.byVersion.get(this.version) as number[] | undefined;
    if (cached) return cached;
    const n = this.version.periods.length;
    const w = this.hourWeights();
    const idx = this.hourlyPeriods();
    const byPeriod = new Array<number>(n).fill(0);
    for (let i = 0; i < idx.length; i++) byPeriod[idx[i]] += w[i];
    const sumW = sumAmounts(byPeriod);
    const shares = byPeriod.map((x) => (sumW > 0 ? x / sumW : 1 / n));
    this.ctx.frame.byVersion.set(this.version, shares);
    return shares;
  }

  periodSplit(): PeriodSplit {
    if (this.split) return this.split;
    const n = this.version.periods.length;
    let usage = new Array<number>(n).fill(0);
    const iv = this.ctx.intervals;
    const unit = this.ctx.tariff.usageUnit;
    if (iv && iv.startMs.length > 0) {
      const idx = this.intervalPeriods();
      // Summed in a typed array by runs of one period (a forecast splits thousands of scaled months), in the same order.
      usage = Array.from(usageByPeriod(iv.usage, idx, n));
      const metered = sumAmounts(usage);
      if (this.ctx.req.intervalsGive === "shape" && metered > 0) {
        const agrees = iv.startMs.length >= iv.expectedCount && agreesWithinRounding(metered, this.ctx.usage);
        this.split = {
          usage: usage.map((u) => (u / metered) * this.ctx.usage),
          total: this.ctx.usage,
          status: agrees ? "exact" : "estimated",
          note: agrees
            ? `split by ${iv.startMs.length} intervals of interval data`
            : `estimated: ${fmt(this.ctx.usage)} ${unit} split by the metered shares of each period (the meter recorded ${fmt(metered)} ${unit} over ${iv.startMs.length} of ${iv.expectedCount} intervals)`,
        };
        return this.split;
      }
      if (iv.startMs.length >= iv.expectedCount) {
        this.split = { usage, total: metered, status: "exact", note: `from ${iv.startMs.length} intervals of interval data` };
        return this.split;
      }
      if (metered > 0) {
        const scaled = usage.map((u) => (u / metered) * this.ctx.usage);
        this.split = {
          usage: scaled,
          total: this.ctx.usage,
          status: "estimated",
          note: `estimated: interval data covers ${iv.startMs.length} of ${iv.expectedCount} intervals, so billed ${fmt(this.ctx.usage)} ${unit} is split by the metered shares`,
        };
        return this.split;
      }
    }
    const shares = this.hourlyShares();
    const shaped = this.hasShape();
    this.split = {
      usage: shares.map((s) => s * this.ctx.usage),
      total: this.ctx.usage,
      status: shaped ? "estimated" : "needs-interval-data",
      note: shaped
        ? "estimated from the building's typical load shape (no interval data); needs interval data to be exact"
        : "needs interval data: usage split in proportion to the hours of each period (estimate)",
    };
    return this.split;
  }
}

