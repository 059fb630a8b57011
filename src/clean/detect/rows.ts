import type { Detection, DetectionAction, DetectionKind } from "./types.ts";

/** One row of OUT/data/data-quality.csv, keys in the file's column order. */
export interface DataQualityRow {
  building_id: string;
  meter_id: string;
  start: string;
  end: string;
  kind: DetectionKind;
  intervals: number;
  action: DetectionAction;
}

/** Column order of data-quality.csv. */
export const DATA_QUALITY_COLUMNS = ["building_id", "meter_id", "start", "end", "kind", "intervals", "action"] as const;

/**
 * Detections → data-quality.csv rows. `start`/`end` are ISO 8601 instants in UTC with a `Z`
 * offset (`2025-03-04T07:00:00.000Z`); `end` is exclusive. Meter detections get their building
 * from `buildingIdOf(meterId)`. A weather detection (meterId null) becomes one row per building
 * that uses the station when `buildingIdsOfStation` is given (meter_id empty), otherwise one row
 * with empty building_id and meter_id. Order is kept.
 * @example detectionsToRows([spike], () => "B1")[0].kind // "spike"
 */
export function detectionsToRows(
  detections: readonly Detection[],
  buildingIdOf: (meterId: string) => string,
  buildingIdsOfStation?: (stationId: string) => readonly string[],
): DataQualityRow[] {
  const rows: DataQualityRow[] = [];
  for (const d of detections) {
    const base = {
      start: new Date(d.startMs).toISOString(),
      end: new Date(d.endMs).toISOString(),
      kind: d.kind,
      intervals: d.intervals,
      action: d.action,
    };
    if (d.meterId !== null) {
      rows.push({ building_id: buildingIdOf(d.meterId), meter_id: d.meterId, ...base });
      continue;
    }
    const buildings = d.stationId !== undefined && buildingIdsOfStation ? buildingIdsOfStation(d.stationId) : [""];
    for (const b of buildings) rows.push({ building_id: b, meter_id: "", ...base });
  }
  return rows;
}
