import type { IntervalSeries } from "../../domain/types.ts";
import { MAD_TO_SIGMA, medianOf, rollingMedianBounds } from "./robustStats.ts";
import { slidingWeekMedians } from "./weekWindowMedians.ts";
import { detectionForRun, flaggedRuns, fmt, followsDirectly, intervalMs, intervalsForHours } from "./seriesGrid.ts";
import type { Detection } from "./types.ts";
import { meterResolution } from "./resolution.ts";

/** Settings for `detectSpikes` (portfolio.yaml `cleaning.spike`). */
export interface SpikeConfig {
  /** Half-width of the rolling-median window, hours (window = 2 × this + one interval). */
  halfWindowHours: number;
  /** A residual must exceed this many robust σ of its time-of-day slot. */
  sigmas: number;
  /** …and this share of the typical level (`typicalLevel`, p90 of |value|). */
  minShareOfLevel: number;
  /** …and this absolute size, in the meter's unit. */
  minAbsolute: number;
  /** …and this share of the local median (a +18 % quarter-hour is load, not a fault). */
  minShareOfMedian: number;
  /** σ is also measured per hour of the week over the weeks within ± this many (seasons differ). */
  seasonHalfWindowWeeks: number;
}

/**
 * Defaults: ±1 h median window, 8 robust σ, at least 25 % of the typical level and 50 % of the
 * local median. Eight σ is far beyond what Gaussian noise produces in a year of 15-minute data
 * (≈ 1e-15 per reading), so what remains is a fault; the level floor keeps quiet slots (nights
 * reading 0 with σ ≈ 0) from flagging tiny wiggles, and the median share keeps equipment
 * staging (a chiller stage, an autoclave cycle: +15–20 % for a quarter-hour) out. σ is the
 * largest of: the time-of-day σ over the whole series, the hour-of-week σ within ±6 weeks, and
 * the meter's resolution (so a threshold is never under 8 steps of the register).
 */
export const DEFAULT_SPIKE_CONFIG: Readonly<SpikeConfig> = Object.freeze({
  halfWindowHours: 1,
  sigmas: 8,
  minShareOfLevel: 0.25,
  minAbsolute: 0,
  minShareOfMedian: 0.5,
  seasonHalfWindowWeeks: 6,
});

const DAY_MS = 86_400_000;
const WEEK_MS = 7 * DAY_MS;

/**
 * Spikes, up or down: readings far from the rolling median of their neighbours.
 * Residual rᵢ = xᵢ − median(x over ±halfWindowHours) (with an even number of readings in the
 * window, the distance to the nearer middle value); σ for the interval's time-of-day slot
 * (local clock when `clockMs` is given, else UTC) = 1.4826 × median |r| over all days in a group of 2 × halfWindow + 1 consecutive slots; flagged when
 * |rᵢ| > sigmas × σ AND |rᵢ| > max(minShareOfLevel × level, minAbsolute, minShareOfMedian × |median|),
 * where σ is the largest of that time-of-day σ, the hour-of-week σ within ±seasonHalfWindowWeeks
 * (`hourOfWeekSigma`) and the meter's resolution (`meterResolution`). The detail gives the reading
 * and the expected range (median ± the largest allowance) with each allowance named.
 * Why this does not flag an office's morning ramp-up: a median follows a step (the window is
 * mostly "before" or mostly "after"), so a ramp leaves small residuals, and the slot's σ is
 * measured at the same time of day, where ramps happen every day.
 * Indices with `skip[i]` = 1 are neither used for the medians nor reported. Adjacent flagged
 * intervals form one detection. Kind `spike`, action `excluded`.
 * @example a daytime reading of 400 kWh among neighbours near 50 → one 1-interval spike
 */
export function detectSpikes(
  series: IntervalSeries,
  level: number,
  config: Partial<SpikeConfig> = {},
  skip?: Uint8Array,
  clockMs?: Float64Array,
): Detection[] {
  const cfg = { ...DEFAULT_SPIKE_CONFIG, ...config };
  const n = series.values.length;
  if (n === 0) return [];
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = skip && skip[i] ? NaN : series.values[i]!;

  const half = intervalsForHours(series, cfg.halfWindowHours);
  const { lo, hi } = rollingMedianOnGrid(series, x, half);
  const resid = new Float64Array(n);
  const med = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const xi = x[i]!;
    // Distance to the nearer of the window's two middle values (0 when between them).
    med[i] = xi > hi[i]! ? hi[i]! : xi < lo[i]! ? lo[i]! : xi;
    resid[i] = xi - med[i]!;
  }

  // Robust σ per time-of-day group: groups of 2 × half + 1 consecutive slots (about ±1 h), so a
  // short series (few days, so few readings per slot) still has a median one spike cannot move.
  const step = intervalMs(series);
  const slots = Math.ceil(DAY_MS / step);
  const width = Math.min(slots, 2 * half + 1);
  const groups = Math.ceil(slots / width);
  const groupOf = new Int32Array(n);
  const counts = new Int32Array(groups);
  for (let i = 0; i < n; i++) {
    const t = clockMs ? clockMs[i]! : series.startMs[i]!;
    const slot = Math.min(slots - 1, Math.floor((((t % DAY_MS) + DAY_MS) % DAY_MS) / step));
    groupOf[i] = Math.floor(slot / width);
    if (Number.isFinite(resid[i]!)) counts[groupOf[i]!]++;
  }
  const absByGroup = Array.from(counts, (c) => new Float64Array(c));
  counts.fill(0);
  for (let i = 0; i < n; i++) {
    if (Number.isFinite(resid[i]!)) absByGroup[groupOf[i]!]![counts[groupOf[i]!]!++] = Math.abs(resid[i]!);
  }
  const sigmaOfDay = Float64Array.from(absByGroup, (xs) => MAD_TO_SIGMA * medianOf(xs));
  const sigmaOfWeek = hourOfWeekSigma(series, resid, clockMs, cfg.seasonHalfWindowWeeks);
  const resolution = meterResolution(series, skip);

  const floor = Math.max(cfg.minShareOfLevel * level, cfg.minAbsolute);
  const finiteOr0 = (x: number | undefined): number => (x !== undefined && Number.isFinite(x) ? x : 0);
  const sigmaAt = (i: number): number => Math.max(finiteOr0(sigmaOfDay[groupOf[i]!]), finiteOr0(sigmaOfWeek?.[i]), resolution);
  /** Half-width of the expected range around the local median at i. */
  const allowance = (i: number): number => Math.max(floor, cfg.minShareOfMedian * Math.abs(med[i]!), sigmaAt(i) > 0 ? cfg.sigmas * sigmaAt(i) : 0);
  const isSpike = (i: number): boolean => {
    const r = resid[i]!;
    if (!Number.isFinite(r)) return false;
    return Math.abs(r) > allowance(i);
  };
  return flaggedRuns(series, isSpike).map(([a, b]) => {
    let worst = a;
    for (let i = a; i < b; i++) if (Math.abs(resid[i]!) > Math.abs(resid[worst]!)) worst = i;
    const sd = sigmaAt(worst);
    const dir = resid[worst]! > 0 ? "up" : "down";
    const m = med[worst]!;
    const half = allowance(worst);
    const sigmaText = sd > 0 ? `${fmt(Math.abs(resid[worst]!) / sd)} robust σ of this hour of the week` : "σ of this time of day ≈ 0";
    return detectionForRun(series, a, b, "spike", "excluded",
      `spike ${dir}: ${fmt(series.values[worst]!)} where ${fmt(m - half)} to ${fmt(m + half)} is expected (local median ${fmt(m)} ± the largest of ${fmt(cfg.sigmas)} σ = ${fmt(cfg.sigmas * sd)}, ${fmt(100 * cfg.minShareOfLevel)} % of the typical level = ${fmt(cfg.minShareOfLevel * level)}, ${fmt(100 * cfg.minShareOfMedian)} % of the median = ${fmt(cfg.minShareOfMedian * Math.abs(m))}); ${sigmaText}; meter resolution ${fmt(resolution)}`);
  });
}

/**
 * Robust σ of the residuals per interval: 1.4826 × median |r| over the same local hour of the
 * week ± 1 h, in the weeks within ±`halfWindowWeeks` of the interval (so a summer afternoon is
 * measured against summer afternoons). Null for series shorter than 3 weeks (too few weeks to
 * compare); NaN where fewer than 12 residuals fall in the window.
 */
function hourOfWeekSigma(series: IntervalSeries, resid: Float64Array, clockMs: Float64Array | undefined, halfWindowWeeks: number): Float64Array | null {
  const n = resid.length;
  if (n === 0) return null;
  const t0 = series.startMs[0]!;
  if (series.startMs[n - 1]! - t0 < 3 * WEEK_MS) return null;
  const weekOf = new Int32Array(n);
  const howOf = new Int32Array(n);
  let weeks = 1;
  for (let i = 0; i < n; i++) {
    weekOf[i] = Math.floor((series.startMs[i]! - t0) / WEEK_MS);
    weeks = Math.max(weeks, weekOf[i]! + 1);
    const t = clockMs ? clockMs[i]! : series.startMs[i]!;
    // epoch day 0 was a Thursday: + 3 days puts Monday 00:00 at hour 0
    howOf[i] = ((Math.floor(t / 3_600_000) + 72) % 168 + 168) % 168;
  }
  const buckets: number[][] = Array.from({ length: weeks * 168 }, () => []);
  for (let i = 0; i < n; i++) if (Number.isFinite(resid[i]!)) buckets[weekOf[i]! * 168 + howOf[i]!]!.push(Math.abs(resid[i]!));
  const sdOfKey = slidingWeekMedians(buckets, weeks, halfWindowWeeks);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = sdOfKey[weekOf[i]! * 168 + howOf[i]!]!;
  return out;
}

/**
 * Rolling median that never reaches across a gap in time: the series is cut into segments of
 * adjacent intervals and each segment gets its own `rollingMedianBounds`.
 */
function rollingMedianOnGrid(series: IntervalSeries, x: Float64Array, half: number): { lo: Float64Array; hi: Float64Array } {
  const n = x.length;
  const lo = new Float64Array(n);
  const hi = new Float64Array(n);
  let a = 0;
  while (a < n) {
    let b = a + 1;
    while (b < n && followsDirectly(series, b)) b++;
    const seg = rollingMedianBounds(x.subarray(a, b), half);
    lo.set(seg.lo, a);
    hi.set(seg.hi, a);
    a = b;
  }
  return { lo, hi };
}
