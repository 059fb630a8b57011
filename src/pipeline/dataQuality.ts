/**
 * Data-quality stage: anomaly detection on every interval meter, meter–weather alignment
 * suggestions, and weather gaps — all as `Detection`s so they land in one table
 * (OUT/data/data-quality.csv) and on the building pages.
 */
import type { Portfolio } from "../domain/types.ts";
import type { WeatherGap } from "../ingest/weatherGrid.ts";
import { detectAnomalies, type Detection } from "../clean/detect/index.ts";
import { suggestAlignment, type AlignmentSuggestion } from "../clean/alignment.ts";

export interface MeterQuality {
  meterId: string;
  buildingId: string;
  detections: Detection[];
  /** 1 = excluded from model training. */
  mask: Uint8Array;
  alignment: AlignmentSuggestion | null;
  /** Offset applied to the meter's timestamps (hours); 0 until a user configures one. */
  appliedOffsetHours: number;
  /** Why the alignment scan was not run, when it was not. */
  alignmentSkipped: string | null;
}

/** Runs the detectors and the alignment scan for every interval meter of the portfolio. */
export function assessIntervalMeters(portfolio: Portfolio): MeterQuality[] {
  const buildings = new Map(portfolio.buildings.map((b) => [b.buildingId, b]));
  const out: MeterQuality[] = [];
  for (const meter of portfolio.meters) {
    const series = portfolio.intervals.get(meter.meterId);
    const building = buildings.get(meter.buildingId);
    if (!series || !building) continue;
    const { detections, mask } = detectAnomalies(series, {}, { timezone: building.timezone });
    const weather = portfolio.weather.get(building.weatherStation);
    let alignment: AlignmentSuggestion | null = null;
    let skipped: string | null = null;
    if (!weather) skipped = `no weather for station ${building.weatherStation}`;
    else if (meter.commodity !== "electricity") skipped = "alignment is scanned for electricity meters only";
    else alignment = suggestAlignment(series, weather, building.timezone, { mask });
    out.push({
      meterId: meter.meterId,
      buildingId: meter.buildingId,
      detections,
      mask,
      alignment,
      appliedOffsetHours: 0,
      alignmentSkipped: skipped,
    });
  }
  return out;
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
