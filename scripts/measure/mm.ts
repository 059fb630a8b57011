const root = process.env.ROOT!;
const { detectAnomalies } = await import(`${root}/src/clean/detect/index.ts`);
const { makeMeter, makeYearWeather, METER_KINDS, METER_ZONE } = await import("/work/wt-clean/test/clean/detect/syntheticMeters.ts");
const byKind: Record<string, Record<string, number>> = {};
const examples: string[] = [];
for (const seed of [1, 2, 3, 4, 5]) {
  const w = makeYearWeather(seed);
  for (const k of METER_KINDS) {
    const s = makeMeter(k, seed, w);
    const { detections } = detectAnomalies(s, {}, { timezone: METER_ZONE });
    for (const x of detections) { (byKind[k] ??= {})[x.kind] = (byKind[k]![x.kind] ?? 0) + 1; }
    for (const x of detections.slice(0, 1)) examples.push(`${s.meterId} ${x.kind} ${new Date(x.startMs).toISOString()} ${x.intervals} ${x.detail}`);
  }
}
console.log(JSON.stringify(byKind));
if (process.env.EX) console.log(examples.join("\n"));
