/**
 * Measures the cleaning stage on invented data (a script, not a test):
 *   npx tsx scripts/measure-cleaning.ts
 * 1. false flags: detections on a year of clean readings of five meter kinds × 5 seeds
 *    (test/clean/detect/syntheticMeters.ts), by kind of meter and of detection;
 * 2. recall: planted faults (five 25× spikes, a stuck register, an outage) found with their kind;
 * 3. clock offsets: offices with thermal lags 0–4 h in heating, cooling and DST seasons, offsets
 *    −5…+5 h, 4 seeds (test/clean/alignmentSynthetic.ts): suggestion right, strong and right,
 *    strong and wrong.
 */
import { detectAnomalies } from "../src/clean/detect/index.ts";
import { suggestAlignment } from "../src/clean/alignment.ts";
import { makeMeter, makeYearWeather, METER_KINDS, METER_ZONE, plantFaults } from "../test/clean/detect/syntheticMeters.ts";
import { ALIGN_ZONE, officeOnStation, seasonWeather } from "../test/clean/alignmentSynthetic.ts";

const falseFlags: Record<string, Record<string, number>> = {};
let found = 0;
let planted = 0;
for (const seed of [1, 2, 3, 4, 5]) {
  const weather = makeYearWeather(seed);
  for (const kind of METER_KINDS) {
    const clean = makeMeter(kind, seed, weather);
    for (const d of detectAnomalies(clean, {}, { timezone: METER_ZONE }).detections) {
      const byKind = (falseFlags[kind] ??= {});
      byKind[d.kind] = (byKind[d.kind] ?? 0) + 1;
    }
    const faulty = plantFaults(clean, kind);
    const { detections, mask } = detectAnomalies(faulty.series, {}, { timezone: METER_ZONE });
    for (const p of faulty.planted) {
      planted++;
      const t = faulty.series.startMs[p.at]!;
      const d = detections.find((x) => x.startMs <= t && t < x.endMs);
      let all = true;
      for (let i = p.at; i < p.at + p.intervals; i++) if (!mask[i]) all = false;
      if (all && (d?.kind === p.kind || (p.kind === "spike" && d?.kind === "reset"))) found++;
    }
  }
}
console.log("false flags on 25 clean meter-years:", JSON.stringify(falseFlags));
console.log(`planted faults found: ${found} of ${planted}`);

for (const lagHours of [0, 1, 2, 3, 4]) {
  const tally = { cases: 0, right: 0, strongRight: 0, strongWrong: 0 };
  for (const season of ["cooling", "heating", "dst"] as const) {
    for (const seed of [1, 2, 3, 4]) {
      const weather = seasonWeather(season, seed);
      for (let offsetHours = -5; offsetHours <= 5; offsetHours++) {
        const a = suggestAlignment(officeOnStation(weather, { season, seed, offsetHours, lagHours }), weather, ALIGN_ZONE);
        tally.cases++;
        if (a.suggestedOffsetHours === offsetHours) tally.right++;
        if (a.strong) a.suggestedOffsetHours === offsetHours ? tally.strongRight++ : tally.strongWrong++;
      }
    }
  }
  console.log(`clock, thermal lag ${lagHours} h:`, JSON.stringify(tally));
}
