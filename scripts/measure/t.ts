import { detectAnomalies } from "../../src/clean/detect/index.ts";
import { makeMeter, makeYearWeather, METER_KINDS, METER_ZONE } from "../../test/clean/detect/syntheticMeters.ts";
const t0 = performance.now();
const w = makeYearWeather(3);
const t1 = performance.now();
const s = makeMeter("coarse-night", 3, w);
const t2 = performance.now();
detectAnomalies(s, {}, { timezone: METER_ZONE });
console.log(t1 - t0, t2 - t1, performance.now() - t2);
for (const seed of [1,2,3,4,5]) { const w = makeYearWeather(seed); for (const k of METER_KINDS) { const d = detectAnomalies(makeMeter(k, seed, w), {}, { timezone: METER_ZONE }).detections; if (d.length) console.log(seed, k, d.length); } }
