import type { IntervalSeries } from "../../domain/types.ts";
import { MAD_TO_SIGMA, medianOf, rollingMedianBounds } from "./robustStats.ts";
import { detectionForRun, flaggedRuns, fmt, followsDirectly, intervalMs, intervalsForHours } from "./seriesGrid.ts";
import type { Detection } from "./types.ts";

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
}

/**
 * Defaults: ±1 h median window, 8 robust σ, and at least 25 % of the typical level. Eight σ is
 * far beyond what Gaussian noise produces in a year of 15-minute data (≈ 1e-15 per reading),
 * so what remains is a fault; the level floor keeps quiet slots (nights reading 0 with σ ≈ 0)
 * from flagging tiny wiggles.
 */
export const DEFAULT_SPIKE_CONFIG: Readonly<SpikeConfig> = Object.freeze({
  halfWindowHours: 1,
  sigmas: 8,
  minShareOfLevel: 0.25,
  minAbsolute: 0,
});

const DAY_MS = 86_400_000;

/**
 * Spikes, up or down: readings far from the rolling median of their neighbours.
 * Residual rᵢ = xᵢ − median(x over ±halfWindowHours) (with an even number of readings in the
 * window, the distance to the nearer middle value); σ for the interval's time-of-day slot
 * (local clock when `clockMs` is given, else UTC) = 1.4826 × median |r| over all days in a group of 2 × halfWindow + 1 consecutive slots; flagged when
 * |rᵢ| > sigmas × σ AND |rᵢ| > max(minShareOfLevel × level, minAbsolute).
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
  const sigma = Float64Array.from(absByGroup, (xs) => MAD_TO_SIGMA * medianOf(xs));
  const slotOf = groupOf;

  const floor = Math.max(cfg.minShareOfLevel * level, cfg.minAbsolute);
  const isSpike = (i: number): boolean => {
    const r = resid[i]!;
    if (!Number.isFinite(r)) return false;
    const a = Math.abs(r);
    const sd = sigma[slotOf[i]!]!;
    return a > floor && (!(sd > 0) || a > cfg.sigmas * sd);
  };
  return flaggedRuns(series, isSpike).map(([a, b]) => {
    let worst = a;
    for (let i = a; i < b; i++) if (Math.abs(resid[i]!) > Math.abs(resid[worst]!)) worst = i;
    const sd = sigma[slotOf[worst]!]!;
    const dir = resid[worst]! > 0 ? "up" : "down";
    const sigmaText = sd > 0 ? `${fmt(Math.abs(resid[worst]!) / sd)} robust σ` : "σ of this time of day ≈ 0";
    return detectionForRun(series, a, b, "spike", "excluded",
      `spike ${dir}: ${fmt(series.values[worst]!)} against a local median of ${fmt(med[worst]!)} (${sigmaText}; threshold ${fmt(cfg.sigmas)} σ and ${fmt(floor)})`);
  });
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
