/**
 * Shared machinery of the zero-run and constant-run detectors: find runs of one repeated
 * value, then ask whether the same time slots on other weeks (or days) usually look the same.
 * A building that is off every night reads zero every night: that is its schedule, not an
 * outage. Only the part of a run that its own history does not explain is reported.
 */
import type { IntervalSeries } from "../../domain/types.ts";
import { detectionForRun, fmt, followsDirectly, intervalMs, intervalsForHours } from "./seriesGrid.ts";
import type { Detection, DetectionKind } from "./types.ts";
import { logChanceOfRun, repeatCounts, type RepeatCounts } from "./runChance.ts";
import { meterResolution } from "./resolution.ts";

/** Settings shared by the zero-run and constant-run detectors. */
export interface FlatRunConfig {
  /** Shortest run worth checking, in hours. */
  minRunHours: number;
  /** Shortest run worth checking, in intervals (protects hourly data from 1–2 equal readings). */
  minRunIntervals: number;
  /** A slot is "usually flat" when at least this share of the other weeks (or days) are flat there too. */
  usualShare: number;
  /** A slot needs at least this many other weeks (or days) with data to be compared at all. */
  minComparisons: number;
  /** Report the run when more than this share of it is not usual. */
  maxUnexplainedShare: number;
  /** Runs at least this long are always reported, whatever the history says (hours). */
  alwaysFlagHours: number;
  /** Compare by hour of week when the series spans at least this many weeks; by hour of day otherwise. */
  minWeeksForWeekly: number;
  /**
   * Report a run only when fewer than this many runs as long would be expected by chance in the
   * whole series, on the meter's own repeat rates at those hours (`logChanceOfRun`): what the
   * meter's resolution and quiet hours explain is not a fault.
   */
  maxChanceRuns: number;
}

const WEEK_MS = 7 * 86_400_000;
const DAY_MS = 86_400_000;

/**
 * Per-interval slot (position within the comparison period) and the period's slot count.
 * Slots are taken on `clockMs` (local wall-clock ms from `localClockMs`) when given, else UTC.
 */
function comparisonSlots(
  series: IntervalSeries,
  minWeeksForWeekly: number,
  clockMs?: Float64Array,
): { slot: Int32Array; slots: number; period: "week" | "day" } {
  const n = series.startMs.length;
  const spanMs = n > 0 ? series.startMs[n - 1]! - series.startMs[0]! + intervalMs(series) : 0;
  const weekly = spanMs >= minWeeksForWeekly * WEEK_MS;
  const periodMs = weekly ? WEEK_MS : DAY_MS;
  const step = intervalMs(series);
  const slots = Math.ceil(periodMs / step);
  const slot = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const t = clockMs ? clockMs[i]! : series.startMs[i]!;
    const inPeriod = ((t % periodMs) + periodMs) % periodMs;
    slot[i] = Math.min(slots - 1, Math.floor(inPeriod / step));
  }
  return { slot, slots, period: weekly ? "week" : "day" };
}

/**
 * Finds runs where `isFlat(i)` holds and `sameAsPrevious(i)` links each interval to the one
 * before (adjacent in time), then keeps those the history does not explain.
 * `usual(i)` says whether interval i would count as flat on another week (for zeros: value 0;
 * for constants: part of any repeat) — it is tallied per slot over the whole series.
 * `clockMs` (optional, from `localClockMs`) puts the slots on the building's local clock.
 */
export function unusualFlatRuns(
  series: IntervalSeries,
  cfg: FlatRunConfig,
  kind: DetectionKind,
  isFlat: (i: number) => boolean,
  sameAsPrevious: (i: number) => boolean,
  usual: (i: number) => boolean,
  skip?: Uint8Array,
  clockMs?: Float64Array,
): Detection[] {
  const n = series.values.length;
  const minLen = Math.max(cfg.minRunIntervals, intervalsForHours(series, cfg.minRunHours));
  const alwaysLen = intervalsForHours(series, cfg.alwaysFlagHours);
  const { slot, slots, period } = comparisonSlots(series, cfg.minWeeksForWeekly, clockMs);

  const total = new Int32Array(slots);
  const usualCount = new Int32Array(slots);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(series.values[i]!)) continue;
    total[slot[i]!]++;
    if (usual(i)) usualCount[slot[i]!]++;
  }

  const out: Detection[] = [];
  const own = new Int32Array(slots);
  // Chance model on hour slots (of the week or day), built only when a run needs judging.
  let chance: RepeatCounts | null = null;
  let chanceByDay: RepeatCounts | undefined;
  let resolution = NaN;
  const chanceCounts = (): RepeatCounts => {
    if (chance) return chance;
    const perHour = Math.max(1, Math.round(60 / series.intervalMinutes));
    const hourSlot = Int32Array.from(slot, (s) => Math.floor(s / perHour));
    const t0 = n > 0 ? series.startMs[0]! : 0;
    const weekOf = Int32Array.from(series.startMs, (t) => Math.floor((t - t0) / WEEK_MS));
    chance = repeatCounts(series, hourSlot, Math.ceil(slots / perHour), weekOf, isFlat);
    // Hour of the day beneath hour of the week: thin weekly slots borrow from the daily ones.
    const hourOfDay = Int32Array.from(hourSlot, (h) => h % 24);
    chanceByDay = period === "week" ? repeatCounts(series, hourOfDay, 24, weekOf, isFlat) : undefined;
    resolution = meterResolution(series, skip);
    return chance;
  };
  let i = 0;
  while (i < n) {
    if (!isFlat(i) || (skip && skip[i])) {
      i++;
      continue;
    }
    let j = i + 1;
    while (j < n && isFlat(j) && !(skip && skip[j]) && followsDirectly(series, j) && sameAsPrevious(j)) j++;
    const len = j - i;
    if (len >= minLen) {
      const found = judgeRun(i, j);
      if (found) out.push(found);
    }
    i = j;
  }
  return out;

  /** Expected number of runs this long by chance in the series, and the sentence that says so. */
  function chanceOf(a: number, b: number): { expectedRuns: number; evidence: string } {
    const counts = chanceCounts();
    const { logP, meanShare } = logChanceOfRun(counts, a, b, 6, chanceByDay);
    const expectedRuns = n * Math.exp(logP);
    const odds = expectedRuns < 1e-6 ? "essentially never" : `${expectedRuns.toPrecision(2)} times`;
    return {
      expectedRuns,
      evidence: `at these hours of the ${period} the meter (resolution ${fmt(resolution)}) continues a repeat ${fmt(100 * meanShare)} % of the time on nearby ${period}s, so a run this long is expected ${odds} in ${n} readings by chance`,
    };
  }

  function judgeRun(a: number, b: number): Detection | null {
    const len = b - a;
    const value = series.values[a]!;
    const hours = (len * series.intervalMinutes) / 60;
    const describe = `${len} interval(s) (${fmt(hours)} h) reading exactly ${fmt(value)}`;
    if (len >= alwaysLen) {
      // Long runs skip the habit test, but not the chance test: a meter whose whole history
      // repeats this value (a steady load read in coarse steps) cannot be told apart from a stuck one.
      const { expectedRuns, evidence } = chanceOf(a, b);
      if (!(expectedRuns < cfg.maxChanceRuns)) return null;
      return detectionForRun(series, a, b, kind, "excluded", `${describe}; longer than ${fmt(cfg.alwaysFlagHours)} h; ${evidence}`);
    }
    for (let k = a; k < b; k++) own[slot[k]!]++;
    const explained = new Uint8Array(len);
    let unexplained = 0;
    for (let k = a; k < b; k++) {
      const s = slot[k]!;
      const others = total[s]! - own[s]!;
      const othersUsual = usualCount[s]! - own[s]!;
      const ok = others >= cfg.minComparisons && othersUsual >= cfg.usualShare * others;
      explained[k - a] = ok ? 1 : 0;
      if (!ok) unexplained++;
    }
    for (let k = a; k < b; k++) own[slot[k]!] = 0;
    if (unexplained <= cfg.maxUnexplainedShare * len) return null;
    // Trim the usual edges: a night that is off every week and runs into an outage keeps its
    // normal hours out of the report, so the detection shows when the outage really began.
    let from = 0;
    let to = len;
    while (from < to && explained[from]) from++;
    while (to > from && explained[to - 1]) to--;
    const trimmed = len - (to - from);
    const note = trimmed > 0 ? `; ${trimmed} interval(s) at its edges are flat on most other ${period}s too and were left out` : "";
    const { expectedRuns, evidence } = chanceOf(a + from, a + to);
    if (!(expectedRuns < cfg.maxChanceRuns)) return null;
    return detectionForRun(
      series,
      a + from,
      a + to,
      kind,
      "excluded",
      `${describe}; ${unexplained} of them at times of ${period} that are not usually like this${note}; ${evidence}`,
    );
  }
}
