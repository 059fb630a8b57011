/**
 * Data-quality stage: clock alignment of interval meters against the weather, anomaly
 * detection on every interval meter, and weather gaps — all reported as `Detection`s so they
 * land in one table (OUT/data/data-quality.csv) and on the building pages.
 *
 * Clock offsets are applied only when configured in portfolio.yaml (`alignment.offsets`), or
 * when `alignment.auto` is on and the scan's suggestion is strong (see src/clean/alignment.ts) and
 * survives the agreement check across meters on the same weather station (src/clean/stationAgreement.ts).
 * An offset of +h means the meter's timestamps run h hours ahead of true time, so the series is
 * shifted back by h hours; flagged intervals are marked (mask), never removed.
 */
import type { Building, IntervalSeries, Meter, Portfolio } from "../domain/types.ts";
import { stationAgreement } from "./stationAgreement.ts";
import type { WeatherGap } from "../domain/types.ts";
import { detectAnomalies, type Detection, type DetectConfigInput, type DetectionResult } from "./detect/index.ts";
import { suggestAlignment, type AlignmentSuggestion } from "./alignment.ts";
import { noMemo, type Memo } from "../core/memo.ts";

const HOUR_MS = 3_600_000;

export interface MeterQuality {
  meterId: string;
  buildingId: string;
  intervalMinutes: number;
  detections: Detection[];
  /** 1 = excluded from model training; aligned with the (possibly shifted) series. */
  mask: Uint8Array;
  /** The scan on the data as read (before any correction). */
  alignment: AlignmentSuggestion | null;
  /** Hours the series was shifted back by (0 when none). */
  appliedOffsetHours: number;
  /** Why an offset was applied: "configured", "automatic (strong evidence)", or null. */
  appliedBecause: string | null;
  /** Why the alignment scan was not run, when it was not. */
  alignmentSkipped: string | null;
}

export interface QualityResult {
  /** The portfolio with corrected interval clocks (the input is not mutated). */
  portfolio: Portfolio;
  meters: MeterQuality[];
}

/** The series with every timestamp moved back by `hours`. */
export function shiftSeries(series: IntervalSeries, hours: number): IntervalSeries {
  if (hours === 0) return series;
  const startMs = new Float64Array(series.startMs.length);
  for (let i = 0; i < startMs.length; i++) startMs[i] = series.startMs[i]! - hours * HOUR_MS;
  return { ...series, startMs };
}

/**
 * Aligns (where allowed) and screens every interval meter of the portfolio. Each meter's scan
 * and screening are pure functions of its series, its weather, its zone and the settings, so
 * `memo` may return them from an earlier build.
 */
export function assessIntervalMeters(portfolio: Portfolio, memo: Memo = noMemo): QualityResult {
  const buildings = new Map(portfolio.buildings.map((b) => [b.buildingId, b]));
  const { offsetsHours, auto } = portfolio.settings.alignment;
  const config = portfolio.settings.cleaning as DetectConfigInput;
  const intervals = new Map(portfolio.intervals);
  const meters: MeterQuality[] = [];
  // First every meter's own scan, then agreement across each weather station, then corrections.
  // The scan screens the series as read; when no offset is applied the screening below is the
  // same computation on the same series, so it reuses that result instead of running it again.
  const screenedRaw = new Map<IntervalSeries, DetectionResult>();
  const scans: Array<{ meter: Meter; building: Building; raw: IntervalSeries; stationId: string; suggestion: AlignmentSuggestion | null; skipped: string | null }> = [];
  for (const meter of portfolio.meters) {
    const raw = portfolio.intervals.get(meter.meterId);
    const building = buildings.get(meter.buildingId);
    if (!raw || !building) continue;
    const weather = portfolio.weather.get(building.weatherStation);
    let suggestion: AlignmentSuggestion | null = null;
    let skipped: string | null = null;
    if (!weather) skipped = `no weather for station ${building.weatherStation}`;
    else if (meter.commodity !== "electricity") skipped = "alignment is scanned for electricity meters only";
    else {
      const timezone = building.timezone;
      suggestion = memo("alignment-scan", { raw, weather, timezone, config }, () => {
        const screened = detectAnomalies(raw, config, { timezone });
        screenedRaw.set(raw, screened);
        return suggestAlignment(raw, weather, timezone, { mask: screened.mask });
      });
    }
    scans.push({ meter, building, raw, stationId: building.weatherStation, suggestion, skipped });
  }
  const agreed = stationAgreement(scans);
  for (const [k, { meter, building, raw, skipped }] of scans.entries()) {
    const alignment = agreed[k] ?? null;

    let applied = 0;
    let because: string | null = null;
    if (meter.meterId in offsetsHours) {
      applied = offsetsHours[meter.meterId]!;
      because = "configured in portfolio.yaml";
    } else if (auto && alignment?.strong && alignment.suggestedOffsetHours !== 0) {
      applied = alignment.suggestedOffsetHours;
      because = "applied automatically: strong evidence and alignment.auto is on";
    }
    const series = shiftSeries(raw, applied);
    intervals.set(meter.meterId, series);
    const timezone = building.timezone;
    const { detections, mask } = memo("screening", { series, timezone, config }, () => screenedRaw.get(series) ?? detectAnomalies(series, config, { timezone }));
    meters.push({
      meterId: meter.meterId,
      buildingId: meter.buildingId,
      intervalMinutes: series.intervalMinutes,
      detections,
      mask,
      alignment,
      appliedOffsetHours: applied,
      appliedBecause: because,
      alignmentSkipped: skipped,
    });
  }
  return { portfolio: { ...portfolio, intervals }, meters };
}

/** Weather gaps as detections (one per gap; `interpolated` when filled, `kept` when left missing). */
export function weatherGapDetections(gaps: readonly WeatherGap[]): Detection[] {
  return gaps.map((g) => ({
    meterId: null,
    stationId: g.stationId,
    kind: "weather-gap" as const,
    startMs: g.startMs,
    endMs: g.endMs,
    intervals: g.hours,
    action: g.action,
    detail:
      g.action === "interpolated"
        ? `${g.hours} missing hour(s) filled by linear interpolation between the neighbouring readings`
        : `${g.hours} missing hour(s) left missing: longer than the interpolation limit`,
  }));
}
