import type { WeatherSeries } from "../../domain/types.ts";
import type { Detection } from "./types.ts";

const HOUR_MS = 3_600_000;

/**
 * Weather gaps as ingest left them: runs of hours marked `filled` (interpolated or derived
 * from daily max/min) → `weather-gap` with action `interpolated`; runs of NaN (gaps longer
 * than the interpolation limit) → `weather-gap` with action `excluded`. `meterId` is null and
 * `stationId` names the station; `intervals` counts hours.
 * @example tempC [10, NaN, NaN, 13] with filled [0, 0, 0, 0] → one excluded gap of 2 h
 */
export function detectWeatherGaps(weather: WeatherSeries): Detection[] {
  const out: Detection[] = [];
  const n = weather.tempC.length;
  const stateAt = (k: number): 0 | 1 | 2 =>
    Number.isNaN(weather.tempC[k]!) ? 2 : weather.filled[k] ? 1 : 0;
  let k = 0;
  while (k < n) {
    const state = stateAt(k);
    if (state === 0) {
      k++;
      continue;
    }
    let j = k + 1;
    while (j < n && stateAt(j) === state) j++;
    const hours = j - k;
    out.push({
      meterId: null,
      stationId: weather.stationId,
      kind: "weather-gap",
      startMs: weather.startMs + k * HOUR_MS,
      endMs: weather.startMs + j * HOUR_MS,
      intervals: hours,
      action: state === 1 ? "interpolated" : "excluded",
      detail:
        state === 1
          ? `${hours} h of temperature filled by interpolation or from daily max/min`
          : `${hours} h of temperature missing (longer than the interpolation limit); those hours are left out`,
    });
    k = j;
  }
  return out;
}
