import { detectAnomalies } from "../../src/clean/detect/index.ts";
import { makeMeter, makeYearWeather, METER_ZONE } from "../../test/clean/detect/syntheticMeters.ts";
const kind = (process.argv[2] ?? "coarse-night") as never;
const w = makeYearWeather(5);
const s = makeMeter(kind, 5, w);
const { detections } = detectAnomalies(s, {}, { timezone: METER_ZONE });
for (const x of detections.filter((d) => d.kind === (process.argv[3] ?? "constant-run")).slice(0, 8)) console.log(new Date(x.startMs).toISOString(), x.intervals, x.detail);
