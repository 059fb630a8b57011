import { detectAnomalies } from "../../src/clean/detect/index.ts";
import { makeMeter, makeYearWeather, METER_KINDS, METER_ZONE } from "../../test/clean/detect/syntheticMeters.ts";
const byKind: Record<string, number> = {};
const examples: string[] = [];
for (const seed of [1, 2, 3, 4, 5]) {
  const w = makeYearWeather(seed);
  for (const k of METER_KINDS) {
    const s = makeMeter(k, seed, w);
    const { detections } = detectAnomalies(s, {}, { timezone: METER_ZONE });
    const d = detections.filter((x) => x.kind !== "missing");
    byKind[k] = (byKind[k] ?? 0) + d.length;
    for (const x of d.slice(0, 2)) examples.push(`${s.meterId} ${x.kind} ${new Date(x.startMs).toISOString()} ${x.intervals} ${x.detail}`);
  }
}
console.log(byKind);
console.log(examples.slice(0, 20).join("\n"));
