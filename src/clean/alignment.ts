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
import type { IntervalSeries, WeatherSeries } from "../domain/types.ts";
import { assertValidZone, localClockMs, offsetAtMs } from "../core/time/index.ts";

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
  /** Offset where the scan's score peaks (a thermal lag puts it up to a few hours after the onset). */
  scanPeakOffsetHours: number;
  /** Where the load's response to temperature begins (`responseOnset`); null when it cannot be read. */
  onsetOffsetHours: number | null;
  /** The onset read on separate stretches of the data (halves; each side of a DST change). */
  onsetChecks: Array<{ label: string; onsetHours: number | null }>;
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
   * so that no single odd week decides the answer; AND the independent readings agree: the
   * response onset is found with a sharp start, the scan's peak lies 0–3 h after it, and every
   * separate stretch whose onset can be read (halves of the data, stretches between DST changes)
   * finds the same onset — when none can be read, the scan's rule above must hold on its own. Only a strong
   * suggestion may be applied automatically. Agreement with other meters on the same station is
   * checked afterwards (`stationAgreement`).
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
  assertValidZone(timezoneOfBuilding);
  const zone = timezoneOfBuilding;

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
      scanPeakOffsetHours: 0,
      onsetOffsetHours: null,
      onsetChecks: [],
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

  // Second, independent reading: where the response begins (a thermal lag delays the scan's peak
  // but not the onset), on all the data and on separate stretches (halves; each side of a DST change).
  const maxLag = Math.min(maxOffset, 7);
  const onsetFit = responseOnset(loadAnom, hourly.firstHour, tempAnom, maxLag);
  const onsetChecks = stretchesOf(hourly, timezoneOfBuilding).map(({ label, from, to }) => ({
    label,
    onsetHours: responseOnset(loadAnom, hourly.firstHour, tempAnom, maxLag, 3, from, to)?.onset ?? null,
  }));
  const zeroIdx = offsets.indexOf(0);
  const scoreAtBest = scores[best]!;
  const scoreAtZero = scores[zeroIdx]!;
  const margin = scoreAtBest > 0 ? (scoreAtBest - scores[second]!) / scoreAtBest : 0;
  const days = Math.floor(pairCounts[best]! / 24);
  const scanPeak = scoreAtBest > 0 ? offsets[best]! : 0;
  const onset = onsetFit?.onset ?? null;
  const suggested = onset ?? scanPeak;
  const scanStrong =
    days >= (options.minDaysForStrong ?? 28) &&
    scoreAtBest >= (options.minScoreForStrong ?? 0.05) &&
    margin >= (options.minMarginForStrong ?? 0.01) &&
    agreement >= (options.minJackknifeAgreementForStrong ?? 0.8);
  // Agreement of the readings: the scan's peak lies at or up to 3 h after the onset (a thermal
  // lag), and every stretch that could be read on its own finds the same onset (when none can be
  // read, the scan's own jackknife over weeks must hold).
  const readStretches = onsetChecks.filter((c) => c.onsetHours !== null);
  const agrees =
    onset !== null &&
    onsetFit!.sharp &&
    scanPeak - onset >= 0 && scanPeak - onset <= 3 &&
    (readStretches.length >= 1 || scanStrong) &&
    readStretches.every((c) => c.onsetHours === onset);
  // The scan's own margin and jackknife ask for one sharp peak, which a short thermal lag spreads
  // over two offsets (onset and the hour after): then the onset readings stand in for them.
  const spreadByShortLag = onset !== null && scanPeak - onset <= 1 && agreement >= 0.5;
  const strong = agrees && days >= (options.minDaysForStrong ?? 28) && scoreAtBest >= (options.minScoreForStrong ?? 0.05) && (scanStrong || spreadByShortLag);

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
      scanPeakOffsetHours: scanPeak,
      onsetOffsetHours: onset,
      onsetChecks,
      note: describe(suggested, series, zone, scoreAtBest) + agreementNote(scanStrong, agrees, scanPeak, onset, onsetChecks),
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

function describe(offset: number, series: IntervalSeries, zone: string, score: number): string {
  if (!(score > 0)) return "no load–temperature relationship found; timestamps left as they are";
  if (offset === 0) return "timestamps agree with the weather";
  const n = series.startMs.length;
  const mid = series.startMs[Math.floor(n / 2)]!;
  const zoneHours = offsetAtMs(zone, mid) / 3_600_000;
  const late = offset > 0 ? `${offset} h late` : `${-offset} h early`;
  const parts = [`meter timestamps look ${late}; subtract ${offset} h to correct`];
  if (zoneHours !== 0 && offset === zoneHours) parts.push("consistent with local clock times stored as UTC");
  if (zoneHours !== 0 && offset === -zoneHours) parts.push("consistent with UTC times read as local clock times");
  if (offset * 60 === series.intervalMinutes) parts.push("consistent with interval-end timestamps");
  return parts.join("; ");
}

/**
 * Onset of the load's response to temperature, in meter hours: a distributed-lag regression of
 * the load anomaly at meter hour H on the temperature anomalies at H − k for k = −maxLag … +maxLag
 * (one ordinary least-squares fit; periodic parts already removed, see the file comment). A
 * building answers the weather late and spread out (thermal mass: the load follows the last
 * hours' temperatures), so the weather-scan peak sits at offset + lag; the response cannot begin
 * before the clock offset, so its onset — the smallest k whose coefficient has the sign of the
 * strongest one and |t| ≥ `minT`, reached from it through neighbours that also qualify — is the
 * offset. Null without enough pairs or response. (OLS standard errors; hourly residuals are
 * autocorrelated, so t is optimistic — the caller asks several independent stretches to agree.)
 */
function responseOnset(
  loadAnom: Float64Array,
  loadFirstHour: number,
  temp: { firstHour: number; anom: Float64Array },
  maxLag: number,
  minT = 3,
  fromHour = 0,
  toHour = loadAnom.length,
): { onset: number; sharp: boolean; coefficients: Array<{ lag: number; beta: number; t: number }>; pairs: number } | null {
  const p = 2 * maxLag + 2; // lags plus intercept
  const xtx = new Float64Array(p * p);
  const xty = new Float64Array(p);
  let yty = 0;
  let pairs = 0;
  const x = new Float64Array(p);
  for (let k = fromHour; k < toHour; k++) {
    const y = loadAnom[k]!;
    if (Number.isNaN(y)) continue;
    let ok = true;
    for (let j = 0; j <= 2 * maxLag; j++) {
      const lag = j - maxLag;
      const tk = loadFirstHour + k - lag - temp.firstHour;
      const v = tk >= 0 && tk < temp.anom.length ? temp.anom[tk]! : NaN;
      if (Number.isNaN(v)) { ok = false; break; }
      x[j] = v;
    }
    if (!ok) continue;
    x[p - 1] = 1;
    for (let a = 0; a < p; a++) {
      xty[a] += x[a]! * y;
      for (let b = 0; b <= a; b++) xtx[a * p + b] += x[a]! * x[b]!;
    }
    yty += y * y;
    pairs++;
  }
  if (pairs < 10 * p) return null;
  for (let a = 0; a < p; a++) for (let b = a + 1; b < p; b++) xtx[a * p + b] = xtx[b * p + a]!;
  const inv = invertSymmetric(xtx, p);
  if (!inv) return null;
  const beta = new Float64Array(p);
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) beta[a] += inv[a * p + b]! * xty[b]!;
  let rss = yty;
  for (let a = 0; a < p; a++) rss -= beta[a]! * xty[a]!;
  const sigma2 = Math.max(rss, 0) / (pairs - p);
  const coefficients = Array.from({ length: 2 * maxLag + 1 }, (_, j) => ({
    lag: j - maxLag,
    beta: beta[j]!,
    t: beta[j]! / Math.sqrt(Math.max(sigma2 * inv[j * p + j]!, 1e-300)),
  }));
  // The response band: the contiguous run of significant coefficients of one sign around the
  // strongest one. A stray significant coefficient away from it (noise, or the temperature's own
  // autocorrelation) is not the onset.
  let peak = 0;
  for (let j = 1; j < coefficients.length; j++) if (Math.abs(coefficients[j]!.t) > Math.abs(coefficients[peak]!.t)) peak = j;
  const sign = Math.sign(coefficients[peak]!.beta);
  const inBand = (j: number): boolean => j >= 0 && Math.sign(coefficients[j]!.beta) === sign && Math.abs(coefficients[j]!.t) >= minT;
  if (!inBand(peak)) return null;
  let first = peak;
  while (inBand(first - 1)) first--;
  // A sharp start: the coefficient before the onset must be plainly zero, or the band may begin
  // earlier than the threshold shows (a long thermal lag spreads the response thin at its start).
  const before = coefficients[first - 1];
  const sharp = before === undefined || Math.abs(before.t) < minT / 2;
  return { onset: coefficients[first]!.lag, sharp, coefficients, pairs };
}

/** Inverse of a symmetric positive-definite p × p matrix (Gauss–Jordan with partial pivoting); null when singular. */
function invertSymmetric(m: Float64Array, p: number): Float64Array | null {
  const a = Float64Array.from(m);
  const inv = new Float64Array(p * p);
  for (let i = 0; i < p; i++) inv[i * p + i] = 1;
  for (let c = 0; c < p; c++) {
    let piv = c;
    for (let r = c + 1; r < p; r++) if (Math.abs(a[r * p + c]!) > Math.abs(a[piv * p + c]!)) piv = r;
    const d = a[piv * p + c]!;
    if (!(Math.abs(d) > 1e-12)) return null;
    if (piv !== c) {
      for (let k = 0; k < p; k++) {
        [a[c * p + k], a[piv * p + k]] = [a[piv * p + k]!, a[c * p + k]!];
        [inv[c * p + k], inv[piv * p + k]] = [inv[piv * p + k]!, inv[c * p + k]!];
      }
    }
    for (let k = 0; k < p; k++) {
      a[c * p + k] /= d;
      inv[c * p + k] /= d;
    }
    for (let r = 0; r < p; r++) {
      if (r === c) continue;
      const f = a[r * p + c]!;
      if (f === 0) continue;
      for (let k = 0; k < p; k++) {
        a[r * p + k] -= f * a[c * p + k]!;
        inv[r * p + k] -= f * inv[c * p + k]!;
      }
    }
  }
  return inv;
}

/**
 * Stretches of the load on which the onset is read again: the two halves (by whole weeks), and,
 * when the data crosses a DST change, the stretches between changes. Only stretches of at least
 * 3 weeks are returned. Hour indices count from the load's first hour.
 */
function stretchesOf(hourly: HourlyLoad, timezone: string): Array<{ label: string; from: number; to: number }> {
  const len = hourly.load.length;
  const out: Array<{ label: string; from: number; to: number }> = [];
  const minLen = 21 * 24;
  const half = Math.floor(len / 2 / 168) * 168;
  if (half >= minLen && len - half >= minLen) {
    out.push({ label: "first half", from: 0, to: half }, { label: "second half", from: half, to: len });
  }
  const cuts = [0];
  for (let k = 1; k < len; k++) {
    const t = (hourly.firstHour + k) * HOUR_MS;
    if (offsetAtMs(timezone, t) !== offsetAtMs(timezone, t - HOUR_MS)) cuts.push(k);
  }
  cuts.push(len);
  if (cuts.length > 2) {
    for (let c = 0; c + 1 < cuts.length; c++) {
      const from = cuts[c]!;
      const to = cuts[c + 1]!;
      const label = `${new Date((hourly.firstHour + from) * HOUR_MS).toISOString().slice(0, 10)} to ${new Date((hourly.firstHour + to) * HOUR_MS).toISOString().slice(0, 10)} (between clock changes)`;
      if (to - from >= minLen) out.push({ label, from, to });
    }
  }
  return out;
}

function agreementNote(
  scanStrong: boolean,
  agrees: boolean,
  scanPeak: number,
  onset: number | null,
  checks: ReadonlyArray<{ label: string; onsetHours: number | null }>,
): string {
  if (onset === null) return "; the start of the load's response to temperature could not be read, so the evidence is not called strong";
  const read = checks.filter((c) => c.onsetHours !== null).map((c) => `${c.label}: ${c.onsetHours} h`).join(", ");
  const parts = [`; the response to temperature begins at ${onset} h and the scan peaks at ${scanPeak} h`];
  if (read) parts.push(` (separate stretches: ${read})`);
  if (scanStrong && !agrees) parts.push("; these readings do not agree, so the evidence is not called strong");
  return parts.join("");
}
