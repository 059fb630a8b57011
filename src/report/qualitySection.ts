/** Building-page view of interval data quality: day × hour heatmap, detections, clock offset. */
import type { Building, IntervalSeries, Meter } from "../domain/types.ts";
import type { ReportMeterQuality, ReportWeatherDetection } from "./input.ts";
import type { HeatmapChartModel, QualitySection, TableModel } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMonth, formatNumber, formatPercent, formatQuantity } from "./format.ts";
import { commodityLabel } from "./labels.ts";
import { civilDay, formatLocalDateTime, localMs, localPartsOf } from "../core/time/index.ts";

const HOUR_MS = 3_600_000;
const DAY_MS = 86_400_000;
/** The heatmap shows at most this many local days, the latest ones (one year plus a leap day). */
const HEATMAP_MAX_DAYS = 366;

/**
 * Local calendar day and hour of a UTC instant in an IANA zone.
 * @example localDayHour(Date.UTC(2025, 0, 1, 6), "America/Chicago") // { day: "2025-01-01", hour: 0 }
 */
export function localDayHour(ms: number, zone: string): { day: string; hour: number } {
  const p = localPartsOf(ms, zone);
  return { day: p.date, hour: p.hour };
}

/** Rounds to 3 significant digits: the heatmap shows colour bands, not exact values (table and CSV carry those). */
function sig3(v: number): number {
  if (v === 0 || !Number.isFinite(v)) return v;
  const digits = Math.max(0, 2 - Math.floor(Math.log10(Math.abs(v))));
  return Math.round(v * 10 ** digits) / 10 ** digits;
}

/**
 * Sums interval values (× multiplier) into local day × hour cells for the last `maxDays` local
 * days of data; an hour is flagged when any of its intervals is flagged in `mask`. In the
 * autumn DST change the repeated local hour holds both clock hours; in the spring change the
 * skipped hour stays empty (null).
 * @example heatmapDays(series, mask, "America/Chicago", 1).length // days with data, ≤ 366
 */
export function heatmapDays(
  series: IntervalSeries,
  mask: Uint8Array | null,
  zone: string,
  multiplier: number,
  maxDays = HEATMAP_MAX_DAYS,
): { day: string; values: (number | null)[]; flagged: number[] }[] {
  const n = series.startMs.length;
  if (n === 0) return [];
  const lastDay = localDayHour(series.startMs[n - 1], zone).day;
  const firstDay = new Date(Date.parse(`${lastDay}T00:00:00Z`) - (maxDays - 1) * 86_400_000).toISOString().slice(0, 10);
  const byDay = new Map<string, { values: (number | null)[]; flagged: number[] }>();
  let cachedHour = Number.NaN;
  let cachedDay = Number.NaN;
  const cached = { day: "", hour: 0 };
  for (let i = 0; i < n; i++) {
    const hourStart = Math.floor(series.startMs[i] / HOUR_MS) * HOUR_MS;
    if (hourStart !== cachedHour) {
      // Local day and hour once per clock hour, the day's date text once per day (this runs for
      // every interval of every meter on every build).
      cachedHour = hourStart;
      const local = localMs(series.startMs[i], zone);
      const dayNum = Math.floor(local / DAY_MS);
      if (dayNum !== cachedDay) {
        cachedDay = dayNum;
        cached.day = civilDay(dayNum).date;
      }
      cached.hour = Math.floor((local - dayNum * DAY_MS) / HOUR_MS);
    }
    if (cached.day < firstDay) continue;
    let row = byDay.get(cached.day);
    if (!row) {
      row = { values: new Array<number | null>(24).fill(null), flagged: new Array<number>(24).fill(0) };
      byDay.set(cached.day, row);
    }
    const v = series.values[i] * multiplier;
    if (Number.isFinite(v)) row.values[cached.hour] = (row.values[cached.hour] ?? 0) + v;
    if (mask && mask[i] === 1) row.flagged[cached.hour] = 1;
  }
  return [...byDay.entries()]
    .sort(([a], [b]) => (a < b ? -1 : 1))
    .map(([day, r]) => ({ day, values: r.values.map((v) => (v == null ? null : sig3(v))), flagged: r.flagged }));
}

/**
 * 99th percentile (nearest rank) of the hourly values of unflagged hours; the heatmap's colour
 * scale stops there. 1 when there are no values.
 * @example colorScaleMax([{ day: "2025-01-01", values: [1, 2, 3], flagged: [0, 0, 1] }]) // 2
 */
export function colorScaleMax(days: readonly { values: readonly (number | null)[]; flagged: readonly number[] }[]): number {
  const vals: number[] = [];
  for (const d of days) d.values.forEach((v, h) => v != null && d.flagged[h] !== 1 && vals.push(v));
  if (vals.length === 0) return 1;
  vals.sort((a, b) => a - b);
  const top = vals[Math.min(vals.length - 1, Math.ceil(0.99 * vals.length) - 1)];
  return top > 0 ? top : 1;
}

const DETECTION_NAMES: Record<string, string> = {
  "zero-run": "Run of zero readings",
  "constant-run": "Run of one repeated value",
  spike: "Spike",
  negative: "Negative reading",
  reset: "Meter reset",
  duplicate: "Duplicated timestamp",
  missing: "Missing intervals",
  "weather-gap": "Gap in weather data",
};

const ACTION_NAMES: Record<string, string> = {
  excluded: "left out of the models (kept in the data)",
  interpolated: "filled by straight-line interpolation",
  kept: "reported only; still used in the models",
  corrected: "corrected",
};

/**
 * Plain words for an action code of data-quality.csv on a meter's detection (others shown as
 * given). For meter data `kept` means reported but still used (src/clean/detect/types.ts).
 * @example actionLabel("excluded") // "left out of the models (kept in the data)"
 */
function actionLabel(action: string): string {
  return ACTION_NAMES[action] ?? action;
}

/**
 * Plain words for the action on a weather gap. Gaps up to `weather_max_gap_hours` are filled
 * by interpolation; a longer gap is `kept`: left missing (its hours carry no temperature, so
 * periods and hours depending on them use what remains).
 * @example weatherActionLabel("kept", 6) // "left missing (longer than the 6-hour limit for filling)"
 */
export function weatherActionLabel(action: string, maxGapHours: number): string {
  if (action === "kept") return `left missing (longer than the ${formatNumber(maxGapHours)}-hour limit for filling)`;
  if (action === "interpolated") return "filled by straight-line interpolation";
  return actionLabel(action);
}

/** @example detectionLabel("zero-run") // "Run of zero readings" */
function detectionLabel(kind: string): string {
  return DETECTION_NAMES[kind] ?? kind;
}

function detectionsTable(q: ReportMeterQuality, zone: string): TableModel | null {
  // No detections: the section's summary ("No problems found in N intervals") says it all.
  if (q.detections.length === 0) return null;
  const rows = [...q.detections].sort((a, b) => a.startMs - b.startMs);
  return {
    caption: `Every problem found in meter ${q.meterId}'s interval data (times in ${zone})`,
    sortable: true,
    columns: [
      { label: "What", numeric: false },
      { label: "From", numeric: false },
      { label: "To", numeric: false },
      { label: "Intervals", numeric: true },
      { label: "Action", numeric: false },
      { label: "Evidence", numeric: false },
    ],
    rows: rows.map((d) => [
      { text: detectionLabel(d.kind) },
      { text: formatLocalDateTime(d.startMs, zone), sort: String(d.startMs) },
      { text: formatLocalDateTime(d.endMs, zone), sort: String(d.endMs) },
      { text: formatNumber(d.intervals), sort: String(d.intervals) },
      { text: actionLabel(d.action) },
      { text: d.detail || NOT_AVAILABLE },
    ]),
  };
}

const signedHours = (h: number) => (h === 0 ? "0 h" : `${h > 0 ? "+" : "−"}${formatNumber(Math.abs(h), 2)} h`);
const hoursText = (h: number) => `${formatNumber(Math.abs(h), 2)} ${Math.abs(h) === 1 ? "hour" : "hours"}`;

/**
 * Plain sentences about the clock-offset check: what was suggested, on what evidence, what was
 * applied. Sign convention of the cleaning stage: offset = meter timestamp − true time, so +3
 * means the readings are stamped 3 hours late and the correction moves them 3 hours earlier.
 * @example alignmentSentences({ suggestedOffsetHours: 3, appliedOffsetHours: 0, strong: true, note: "", scores: [] })[0] // "… stamped 3 hours late …"
 */
export function alignmentSentences(a: ReportMeterQuality["alignment"]): string[] {
  if (!a) return [];
  const at = (h: number) => a.scores.find((s) => s.offsetHours === h)?.score;
  const best = at(a.suggestedOffsetHours);
  const zero = at(0);
  const out: string[] = [];
  const checked = best != null && best > 0;
  if (a.suggestedOffsetHours === 0 && !checked) {
    out.push("The meter's clock could not be checked against the weather station's: no relationship between load and outdoor temperature was found, so the timestamps were left as they are.");
  } else if (a.suggestedOffsetHours === 0) {
    out.push("The meter's clock agrees with the weather station's: the load follows outdoor temperature best with no shift.");
  } else {
    const evidence =
      best != null && zero != null
        ? ` With that correction temperature explains ${formatPercent(best, 0)} of the load's hour-to-hour variation left after its weekly routine, against ${formatPercent(zero, 0)} without it.`
        : "";
    const late = a.suggestedOffsetHours > 0;
    out.push(
      `The meter's readings appear to be stamped ${hoursText(a.suggestedOffsetHours)} ${late ? "late" : "early"} against the weather: the load follows outdoor temperature best when they are moved ${hoursText(a.suggestedOffsetHours)} ${late ? "earlier" : "later"}.${evidence} The evidence is ${a.strong ? "strong" : "weak"}.`,
    );
  }
  out.push(a.appliedOffsetHours === 0 ? "No correction was applied to the data." : `A correction of ${signedHours(a.appliedOffsetHours)} (offset removed from the timestamps) was applied before modelling.`);
  out.push(...noteSentences(a.note, a.scores.length === 0));
  return out;
}

/**
 * The cleaning stage's note, folded into the sentences above: parts that repeat them ("timestamps
 * agree with the weather", "meter timestamps look 3 h late; subtract 3 h", "no load–temperature
 * relationship found") are dropped; "consistent with …" hints become one sentence; anything else
 * is kept as a sentence of its own. Without scores the note is why the scan did not run.
 */
function noteSentences(note: string, noScan: boolean): string[] {
  if (!note) return [];
  if (noScan) return [`The scan did not run: ${note}.`];
  const parts = note.split(";").map((p) => p.trim()).filter((p) => p.length > 0);
  const repeats = [/^timestamps agree with the weather$/i, /^meter timestamps look /i, /^subtract /i, /^no load.temperature relationship found/i, /^timestamps left as they are$/i];
  const kept = parts.filter((p) => !repeats.some((r) => r.test(p)));
  const consistent = kept.filter((p) => /^consistent with /i.test(p)).map((p) => p.replace(/^consistent with /i, ""));
  const other = kept.filter((p) => !/^consistent with /i.test(p));
  const out: string[] = [];
  if (consistent.length > 0) out.push(`The shift is consistent with ${consistent.join(", or with ")}.`);
  for (const p of other) out.push(/[.!?]$/.test(p) ? capitalize(p) : `${capitalize(p)}.`);
  return out;
}

function capitalize(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

function alignmentTable(q: ReportMeterQuality): TableModel | null {
  const a = q.alignment;
  if (!a || a.scores.length === 0) return null;
  return {
    caption: `Clock-offset scan of meter ${q.meterId}: partial R² of temperature per offset tried (suggested offset highlighted)`,
    sortable: true,
    columns: [
      { label: "Offset tried (meter − true time)", numeric: true },
      { label: "Partial R² of temperature", numeric: true },
    ],
    rows: [...a.scores]
      .sort((x, y) => x.offsetHours - y.offsetHours)
      .map((s) => [
        { text: signedHours(s.offsetHours), sort: String(s.offsetHours) },
        { text: formatNumber(s.score, 3), sort: String(s.score), tone: s.offsetHours === a.suggestedOffsetHours ? ("pos" as const) : undefined },
      ]),
  };
}

function heatmapChart(q: ReportMeterQuality, meter: Meter, series: IntervalSeries, zone: string): HeatmapChartModel | null {
  const days = heatmapDays(series, q.mask.length === series.startMs.length ? q.mask : null, zone, meter.multiplier);
  if (days.length === 0) return null;
  const flaggedHours = days.reduce((s, d) => s + d.flagged.reduce((a, f) => a + f, 0), 0);
  const valueLabel = `Use per hour (${meter.unit})`;
  const first = days[0].day;
  const last = days[days.length - 1].day;
  return {
    id: `quality-${meter.meterId.replace(/[^A-Za-z0-9_-]/g, "_")}-heatmap`,
    kind: "quality-heatmap",
    title: `Meter ${meter.meterId}: use by day and hour`,
    description: `Calendar heatmap of meter ${meter.meterId}, ${first} to ${last} (local time, ${zone}): one column per day, one row per hour, darker is more use in ${meter.unit} (the darkest shade covers everything from the 99th percentile up); ${flaggedHours === 0 ? "no hour holds a flagged interval" : `${formatNumber(flaggedHours)} ${flaggedHours === 1 ? "hour holds" : "hours hold"} flagged intervals, marked in orange`}.`,
    valueLabel,
    days,
    colorMax: colorScaleMax(days),
    table: monthlyHeatmapTable(meter, days),
  };
}

/** The heatmap's text equivalent, by local calendar month (the detections table lists each flagged run). */
function monthlyHeatmapTable(meter: Meter, days: HeatmapChartModel["days"]): TableModel {
  const months = new Map<string, { use: number; days: number; hours: number; flagged: number }>();
  for (const d of days) {
    const m = months.get(d.day.slice(0, 7)) ?? { use: 0, days: 0, hours: 0, flagged: 0 };
    m.days++;
    for (const v of d.values) if (v != null) { m.use += v; m.hours++; }
    for (const f of d.flagged) m.flagged += f;
    months.set(d.day.slice(0, 7), m);
  }
  return {
    caption: `Meter ${meter.meterId}: interval use and flagged hours by month (local time)`,
    sortable: false,
    columns: [
      { label: "Month", numeric: false },
      { label: `Use (${meter.unit})`, numeric: true },
      { label: "Days with data", numeric: true },
      { label: "Hours with data", numeric: true },
      { label: "Flagged hours", numeric: true },
    ],
    rows: [...months.entries()].map(([month, m]) => [
      { text: formatMonth(month), sort: month },
      { text: formatQuantity(m.use, meter.unit), sort: String(m.use) },
      { text: formatNumber(m.days) },
      { text: formatNumber(m.hours) },
      { text: formatNumber(m.flagged), tone: m.flagged > 0 ? ("warn" as const) : undefined },
    ]),
  };
}

/**
 * One data-quality section per interval meter of the building that has quality results.
 */
export function qualitySections(
  building: Building,
  meters: Meter[],
  quality: readonly ReportMeterQuality[] | undefined,
  intervals: ReadonlyMap<string, IntervalSeries>,
): QualitySection[] {
  if (!quality) return [];
  const out: QualitySection[] = [];
  for (const m of meters) {
    const q = quality.find((x) => x.meterId === m.meterId);
    if (!q) continue;
    const series = intervals.get(m.meterId);
    const chart = series ? heatmapChart(q, m, series, building.timezone) : null;
    const flagged = q.mask.reduce((s, v) => s + (v === 1 ? 1 : 0), 0);
    const total = series?.startMs.length ?? q.mask.length;
    out.push({
      meterId: m.meterId,
      heading: `${commodityLabel(m.commodity)} meter ${m.meterId} (${formatNumber(q.intervalMinutes)}-minute data)`,
      summary:
        q.detections.length === 0
          ? `No problems found in ${formatNumber(total)} intervals.`
          : `${formatNumber(q.detections.length)} ${q.detections.length === 1 ? "problem" : "problems"} found; ${formatNumber(flagged)} of ${formatNumber(total)} intervals are flagged and left out of the models and of the bill checks (they stay in the data; bills are compared on the other readings, scaled up by coverage, and each finding shows the raw figure beside it).`,
      charts: chart ? [chart] : [],
      detectionsTable: detectionsTable(q, building.timezone),
      alignment: alignmentSentences(q.alignment),
      alignmentTable: alignmentTable(q),
    });
  }
  return out;
}

/** Weather gaps of one station; null when none were reported for it. */
export function weatherQualityTable(building: Building, detections: readonly ReportWeatherDetection[] | undefined, maxGapHours: number): TableModel | null {
  const rows = (detections ?? []).filter((d) => d.stationId === building.weatherStation).sort((a, b) => a.startMs - b.startMs);
  if (rows.length === 0) return null;
  return {
    caption: `Gaps in weather station ${building.weatherStation}'s hourly temperatures (times in ${building.timezone})`,
    sortable: false,
    columns: [
      { label: "From", numeric: false },
      { label: "To", numeric: false },
      { label: "Hours", numeric: true },
      { label: "Action", numeric: false },
    ],
    rows: rows.map((d) => [
      { text: formatLocalDateTime(d.startMs, building.timezone), sort: String(d.startMs) },
      { text: formatLocalDateTime(d.endMs, building.timezone), sort: String(d.endMs) },
      { text: formatNumber(d.hours) },
      { text: weatherActionLabel(d.action, maxGapHours) },
    ]),
  };
}
