const root = process.env.ROOT!;
const { detectAnomalies } = await import(`${root}/src/clean/detect/index.ts`);
const { makeMeter, makeYearWeather, METER_KINDS, METER_ZONE, plantFaults } = await import("/work/wt-clean/test/clean/detect/syntheticMeters.ts");
let found = 0, total = 0, extra = 0;
const misses: string[] = [];
for (const seed of [1, 2, 3, 4, 5]) {
  const w = makeYearWeather(seed);
  for (const k of METER_KINDS) {
    const { series, planted } = plantFaults(makeMeter(k, seed, w), k);
    const { detections, mask } = detectAnomalies(series, {}, { timezone: METER_ZONE });
    for (const p of planted) {
      total++;
      let ok = true;
      for (let i = p.at; i < p.at + p.intervals; i++) if (!mask[i]) ok = false;
      const d = detections.find((x: any) => x.startMs <= series.startMs[p.at] && series.startMs[p.at] < x.endMs);
      if (ok && d?.kind === p.kind) found++; else misses.push(`${k}-${seed} ${p.kind} ${new Date(series.startMs[p.at]).toISOString()} got ${d?.kind} ${d?.intervals}`);
    }
    const covered = (x: any) => planted.some((p: any) => x.startMs < series.startMs[p.at + p.intervals - 1] + 900000 && series.startMs[p.at] < x.endMs);
    extra += detections.filter((x: any) => !covered(x)).length;
  }
}
console.log(JSON.stringify({ found, total, falseFlagsBesidePlanted: extra }));
console.log(misses.slice(0, 15).join("\n"));
