/**
 * Meter–weather time alignment: is the meter's clock offset from the weather's by whole hours?
 *
 * Sign convention: `suggestedOffsetHours` = (meter timestamp − true time), in hours. A meter
 * whose readings are stamped 3 h late gets +3, and the correction is to SUBTRACT 3 h from its
 * timestamps. For a building in UTC−4 (summer, America/New_York): local wall-clock times stored
 * as if they were UTC give −4; UTC times read as local wall-clock give +4. Interval-END stamping
 * (a reading stamped when its interval closes) is an offset of one interval: +1 for hourly data,
 * but only +0.25 h for 15-minute data, which a whole-hour scan reports as 0 — that case is
 * handled by the `interval_timestamp: end` setting, not by this scan.
 *
 * Method (why it works): a building's load repeats weekly (schedule) and temperature repeats
 * daily, so ANY offset lines the two cycles up somehow, and a raw load–temperature correlation
 * is maximal wherever the occupied hours meet the warm afternoon — not at the true offset.
 * We therefore remove the periodic parts first: hourly load minus its mean for that local hour
 * of the week, temperature minus its mean for that hour of the day, both within blocks of
 * `blockDays` (seasons change both). What is left is weather that does not repeat (a hot
 * afternoon, a cool front) and the load's response to it, which happens at the true time. For
 * each offset h in −maxOffsetHours…+maxOffsetHours the score is the squared correlation of
 * load anomaly at meter hour H with temperature anomaly at hour H − h, averaged over blocks
 * weighted by pairs (squared, so heating seasons count as much as cooling ones). By the
 * Frisch–Waugh–Lovell theorem this is the partial R² of temperature in a regression of load on
 * temperature plus time-of-week dummies. A schedule with no offset cannot create a false peak
 * elsewhere, because the schedule's share of the load is removed before any correlation.
 */
import { IANAZone } from "luxon";
import type { IntervalSeries, WeatherSeries } from "../domain/types.ts";
import { localClockMs } from "./detect/localClock.ts";

const HOUR_MS = 3_600_000;

export interface AlignmentOptions {
  /** Intervals to leave out (mask from `detectAnomalies`: 1 = excluded). */
  mask?: Uint8Array;
  /** Offsets scanned: −max…+max whole hours. Default 14. */
  maxOffsetHours?: number;
  /** Length of the blocks within which periodic means are removed, days, rounded to whole weeks. Default 56 (8 weeks). */
  blockDays?: number;
  /** `strong` needs at least this many days of paired data. Default 28. */
  minDaysForStrong?: number;
  /** `strong` needs a best score (partial R²) of at least this. Default 0.05. */
  minScoreForStrong?: number;
  /** `strong` needs the best to beat the runner-up by this share of the best score. Default 0.01. */
  minMarginForStrong?: number;
  /** `strong` needs this share of leave-one-week-out rescans to keep the same best offset. Default 0.8. */
  minJackknifeAgreementForStrong?: number;
}

export interface AlignmentEvidence {
  method: "partial-r2-time-of-week";
  /** Score (partial R² of temperature, 0…1) with the timestamps as they are. */
  scoreAtZero: number;
  scoreAtBest: number;
  /** Offset with the second-highest score (usually a neighbour of the best). */
  secondBestOffset: number;
  /** (scoreAtBest − score at secondBestOffset) / scoreAtBest; 0 when there is no signal. */
  margin: number;
  /** Days of paired load and temperature at the best offset. */
  days: number;
  /** Leave-one-week-out rescans done (weeks with at least 3 days of pairs). */
  jackknifeRuns: number;
  /** Of those, rescans whose best offset is still `suggestedOffsetHours`. */
  jackknifeAgreeing: number;
  /** Score per offset, from −max to +max. */
  scores: Array<{ offsetHours: number; score: number }>;
  /** Plain-language reading of the suggestion (e.g. local time stored as UTC). */
  note: string;
}

export interface AlignmentSuggestion {
  meterId: string;
  suggestedOffsetHours: number;
  evidence: AlignmentEvidence;
  /**
   * Rule (defaults in `AlignmentOptions`): days ≥ 28 AND scoreAtBest ≥ 0.05 AND margin ≥ 0.01
   * AND at least 80 % of the leave-one-week-out rescans keep the same best offset (jackknife),
   * so that no single odd week decides the answer. Only a strong suggestion may be applied
   * automatically.
   */
  strong: boolean;
}

/**
 * Scans whole-hour offsets between a meter and its weather and suggests the best (see the file
 * comment for method and sign). With no usable data the suggestion is 0, not strong, and the
 * note says why.
 * @throws RangeError when `timezoneOfBuilding` is not a valid IANA zone.
 * @example suggestAlignment(series, weather, "America/New_York").suggestedOffsetHours // 3 when stamps are 3 h late
 */
export function suggestAlignment(
  series: IntervalSeries,
  weather: WeatherSeries,
  timezoneOfBuilding: string,
  options: AlignmentOptions = {},
): AlignmentSuggestion {
  const maxOffset = Math.max(0, Math.floor(options.maxOffsetHours ?? 14));
  const blockDays = options.blockDays ?? 56;
  const zone = IANAZone.create(timezoneOfBuilding);
  if (!zone.isValid) throw new RangeError(`unknown time zone '${timezoneOfBuilding}'`);

  const hourly = hourlyLoad(series, options.mask);
  const offsets: number[] = [];
  for (let h = -maxOffset; h <= maxOffset; h++) offsets.push(h);
  const empty = (note: string): AlignmentSuggestion => ({
    meterId: series.meterId,
    suggestedOffsetHours: 0,
    evidence: {
      method: "partial-r2-time-of-week",
      scoreAtZero: 0,
      scoreAtBest: 0,
      secondBestOffset: 0,
      margin: 0,
      days: 0,
      jackknifeRuns: 0,
      jackknifeAgreeing: 0,
      scores: offsets.map((offsetHours) => ({ offsetHours, score: 0 })),
      note,
    },
    strong: false,
  });
  if (!hourly) return empty("no complete hours of interval data (or intervals longer than an hour)");

  const blockWeeks = Math.max(1, Math.round(blockDays / 7));
  const { blockOf, blocks } = blockPartition(hourly.load.length, blockWeeks * 168);
  const loadAnom = loadAnomalies(hourly, timezoneOfBuilding, blockOf, blocks);
  const tempAnom = temperatureAnomalies(weather, hourly.firstHour, blockOf, blocks);

  // Per offset and week: moments of the pairs. Blocks are whole weeks, so block moments are
  // sums of week moments, and leaving a week out is a subtraction.
  const weeks = Math.ceil(hourly.load.length / 168);
  const weekMoments = offsets.map((h) => weeklyMoments(loadAnom, hourly.firstHour, tempAnom, h));
  const blockMoments = weekMoments.map((byWeek) => {
    const byBlock: Moments[] = Array.from({ length: blocks }, () => new Float64Array(6));
    byWeek.forEach((m, w) => {
      const target = byBlock[blockOf(w * 168)]!;
      for (let q = 0; q < 6; q++) target[q] += m[q]!;
    });
    return byBlock;
  });
  const scoreWithout = (k: number, leftOut: number): { score: number; pairs: number } => {
    let weighted = 0;
    let pairs = 0;
    blockMoments[k]!.forEach((m, b) => {
      let use = m;
      if (leftOut >= 0 && blockOf(leftOut * 168) === b) {
        use = m.slice();
        const out = weekMoments[k]![leftOut]!;
        for (let q = 0; q < 6; q++) use[q] -= out[q]!;
      }
      weighted += use[0]! * r2Of(use);
      pairs += use[0]!;
    });
    return { score: pairs > 0 ? weighted / pairs : 0, pairs };
  };
  const full = offsets.map((_, k) => scoreWithout(k, -1));
  const scores = full.map((r) => r.score);
  const pairCounts = full.map((r) => r.pairs);
  if (pairCounts.every((p) => p === 0)) return empty("interval data and weather do not overlap");

  const best = argBest(offsets, scores);
  let second = best === 0 ? Math.min(1, offsets.length - 1) : 0;
  for (let k = 0; k < offsets.length; k++) if (k !== best && scores[k]! > scores[second]!) second = k;

  // Jackknife: leave each week (with at least 3 days of pairs) out in turn and see whether the
  // best offset stays the same. A suggestion carried by one odd week does not survive this.
  let jackknifeRuns = 0;
  let jackknifeAgreeing = 0;
  if (weeks > 1) {
    for (let w = 0; w < weeks; w++) {
      if (weekMoments[best]![w]![0]! < 72) continue;
      jackknifeRuns++;
      if (argBest(offsets, offsets.map((_, k) => scoreWithout(k, w).score)) === best) jackknifeAgreeing++;
    }
  }
  const agreement = jackknifeRuns > 0 ? jackknifeAgreeing / jackknifeRuns : 0;

  const zeroIdx = offsets.indexOf(0);
  const scoreAtBest = scores[best]!;
  const scoreAtZero = scores[zeroIdx]!;
  const margin = scoreAtBest > 0 ? (scoreAtBest - scores[second]!) / scoreAtBest : 0;
  const days = Math.floor(pairCounts[best]! / 24);
  const suggested = scoreAtBest > 0 ? offsets[best]! : 0;
  const strong =
    days >= (options.minDaysForStrong ?? 28) &&
    scoreAtBest >= (options.minScoreForStrong ?? 0.05) &&
    margin >= (options.minMarginForStrong ?? 0.01) &&
    agreement >= (options.minJackknifeAgreementForStrong ?? 0.8);

  return {
    meterId: series.meterId,
    suggestedOffsetHours: suggested,
    evidence: {
      method: "partial-r2-time-of-week",
      scoreAtZero,
      scoreAtBest,
      secondBestOffset: offsets[second]!,
      margin,
      days,
      jackknifeRuns,
      jackknifeAgreeing,
      scores: offsets.map((offsetHours, k) => ({ offsetHours, score: scores[k]! })),
      note: describe(suggested, series, zone, scoreAtBest),
    },
    strong,
  };
}

/** Index of the highest score; ties go to the smaller |offset| (the data as given). */
function argBest(offsets: readonly number[], scores: readonly number[]): number {
  let best = 0;
  for (let k = 1; k < offsets.length; k++) {
    if (scores[k]! > scores[best]! || (scores[k] === scores[best] && Math.abs(offsets[k]!) < Math.abs(offsets[best]!))) best = k;
  }
  return best;
}

interface HourlyLoad {
  /** Absolute hour number (epoch ms / 1 h) of hourly[0]. */
  firstHour: number;
  /** Load per hour; NaN unless every interval of the hour is present and unmasked. */
  load: Float64Array;
}

/** Sums intervals into UTC hours; an hour counts only when all of its intervals are there. */
function hourlyLoad(series: IntervalSeries, mask?: Uint8Array): HourlyLoad | null {
  const n = series.startMs.length;
  if (n === 0 || series.intervalMinutes > 60 || 60 % series.intervalMinutes !== 0) return null;
  const perHour = 60 / series.intervalMinutes;
  const firstHour = Math.floor(series.startMs[0]! / HOUR_MS);
  const lastHour = Math.floor(series.startMs[n - 1]! / HOUR_MS);
  const len = lastHour - firstHour + 1;
  const sum = new Float64Array(len);
  const count = new Int32Array(len);
  for (let i = 0; i < n; i++) {
    const v = series.values[i]!;
    if (!Number.isFinite(v) || (mask && mask[i])) continue;
    const k = Math.floor(series.startMs[i]! / HOUR_MS) - firstHour;
    sum[k] += v;
    count[k]++;
  }
  const load = new Float64Array(len);
  let any = false;
  for (let k = 0; k < len; k++) {
    load[k] = count[k] === perHour ? sum[k]! : NaN;
    if (count[k] === perHour) any = true;
  }
  return any ? { firstHour, load } : null;
}

/** Load minus its block's mean for the same local hour of the week (NaN with < 2 samples). */
function loadAnomalies(hourly: HourlyLoad, timezone: string, blockOf: (k: number) => number, blocks: number): Float64Array {
  const len = hourly.load.length;
  const slot = localHourOfWeek(hourly.firstHour, len, timezone);
  const sum = new Float64Array(168 * blocks);
  const cnt = new Int32Array(168 * blocks);
  for (let k = 0; k < len; k++) {
    const v = hourly.load[k]!;
    if (Number.isNaN(v)) continue;
    const g = blockOf(k) * 168 + slot[k]!;
    sum[g] += v;
    cnt[g]++;
  }
  const out = new Float64Array(len).fill(NaN);
  for (let k = 0; k < len; k++) {
    const g = blockOf(k) * 168 + slot[k]!;
    if (!Number.isNaN(hourly.load[k]!) && cnt[g]! >= 2) out[k] = hourly.load[k]! - sum[g]! / cnt[g]!;
  }
  return out;
}

/**
 * Block of each hour k (counted from the load's first hour): whole blocks of `blockHours`,
 * a short last block (< half a block) merged into the one before; hours before the start fall
 * in block 0 and hours after the end in the last block.
 */
function blockPartition(len: number, blockHours: number): { blockOf: (k: number) => number; blocks: number } {
  const full = Math.floor(len / blockHours);
  const rest = len - full * blockHours;
  const blocks = Math.max(1, rest >= blockHours / 2 || full === 0 ? full + 1 : full);
  return { blocks, blockOf: (k) => Math.min(blocks - 1, Math.max(0, Math.floor(k / blockHours))) };
}

/** Local hour of the week (0 = Monday 00:00 local) for each hour from `firstHour`. */
function localHourOfWeek(firstHour: number, len: number, timezone: string): Int32Array {
  const clock = localClockMs(Float64Array.from({ length: len }, (_, k) => (firstHour + k) * HOUR_MS), timezone);
  // Epoch hour 0 was Thursday 00:00; +72 h makes Monday 00:00 slot 0.
  return Int32Array.from(clock, (ms) => (((Math.floor(ms / HOUR_MS) + 72) % 168) + 168) % 168);
}

/**
 * Temperature minus its block's mean for the same UTC hour of the day, indexed by absolute
 * hour. The diurnal cycle follows the sun, not the clock, so UTC hours suit it (no DST jump).
 * Blocks are the load's blocks (`blockOf` counts hours from `origin`).
 */
function temperatureAnomalies(
  weather: WeatherSeries,
  origin: number,
  blockOf: (k: number) => number,
  blocks: number,
): { firstHour: number; anom: Float64Array } {
  const firstHour = Math.round(weather.startMs / HOUR_MS);
  const len = weather.tempC.length;
  const sum = new Float64Array(24 * blocks);
  const cnt = new Int32Array(24 * blocks);
  const groupOf = (k: number): number => blockOf(firstHour + k - origin) * 24 + ((((firstHour + k) % 24) + 24) % 24);
  for (let k = 0; k < len; k++) {
    const t = weather.tempC[k]!;
    if (!Number.isFinite(t)) continue;
    sum[groupOf(k)] += t;
    cnt[groupOf(k)]++;
  }
  const anom = new Float64Array(len).fill(NaN);
  for (let k = 0; k < len; k++) {
    const t = weather.tempC[k]!;
    const g = groupOf(k);
    if (Number.isFinite(t) && cnt[g]! >= 2) anom[k] = t - sum[g]! / cnt[g]!;
  }
  return { firstHour, anom };
}

/** Sums for one correlation: n, Σx, Σy, Σx², Σy², Σxy. */
type Moments = Float64Array;

/** Squared correlation from moments; 0 when either side has no variance or n < 3. */
function r2Of(m: Moments): number {
  const n = m[0]!;
  if (n < 3) return 0;
  const cxx = m[3]! - (m[1]! * m[1]!) / n;
  const cyy = m[4]! - (m[2]! * m[2]!) / n;
  const cxy = m[5]! - (m[1]! * m[2]!) / n;
  return cxx > 0 && cyy > 0 ? (cxy * cxy) / (cxx * cyy) : 0;
}

/**
 * Moments of (load anomaly at H, temperature anomaly at H − h), one set per week of the load
 * (week w = hours [168w, 168w + 168) from the load's first hour). Blocks are whole weeks, so
 * block moments are sums of week moments.
 */
function weeklyMoments(
  loadAnom: Float64Array,
  loadFirstHour: number,
  temp: { firstHour: number; anom: Float64Array },
  h: number,
): Moments[] {
  const len = loadAnom.length;
  const weeks = Math.ceil(len / 168);
  const out: Moments[] = Array.from({ length: weeks }, () => new Float64Array(6));
  for (let k = 0; k < len; k++) {
    const x = loadAnom[k]!;
    if (Number.isNaN(x)) continue;
    const tk = loadFirstHour + k - h - temp.firstHour;
    if (tk < 0 || tk >= temp.anom.length) continue;
    const y = temp.anom[tk]!;
    if (Number.isNaN(y)) continue;
    const m = out[Math.floor(k / 168)]!;
    m[0]++;
    m[1] += x;
    m[2] += y;
    m[3] += x * x;
    m[4] += y * y;
    m[5] += x * y;
  }
  return out;
}

function describe(offset: number, series: IntervalSeries, zone: IANAZone, score: number): string {
  if (!(score > 0)) return "no load–temperature relationship found; timestamps left as they are";
  if (offset === 0) return "timestamps agree with the weather";
  const n = series.startMs.length;
  const mid = series.startMs[Math.floor(n / 2)]!;
  const zoneHours = zone.offset(mid) / 60;
  const late = offset > 0 ? `${offset} h late` : `${-offset} h early`;
  const parts = [`meter timestamps look ${late}; subtract ${offset} h to correct`];
  if (zoneHours !== 0 && offset === zoneHours) parts.push("consistent with local clock times stored as UTC");
  if (zoneHours !== 0 && offset === -zoneHours) parts.push("consistent with UTC times read as local clock times");
  if (offset * 60 === series.intervalMinutes) parts.push("consistent with interval-end timestamps");
  return parts.join("; ");
}
