const root = process.env.ROOT!;
const { suggestAlignment } = await import(`${root}/src/clean/alignment.ts`);
const { officeOnStation, seasonWeather, ALIGN_ZONE } = await import("/work/wt-clean/test/clean/alignmentSynthetic.ts");
const lag = Number(process.env.LAG ?? 1);
const res: Record<string, { right: number; strongRight: number; strongWrong: number; n: number }> = {};
for (const season of ["cooling", "heating", "dst"] as const) {
  for (const seed of [1, 2, 3, 4]) {
    const w = seasonWeather(season, seed);
    for (let off = -5; off <= 5; off++) {
      const s = officeOnStation(w, { season, seed, offsetHours: off, lagHours: lag });
      const a = suggestAlignment(s, w, ALIGN_ZONE);
      const key = `${season} off=${off}`;
      const r = (res[off === 0 ? `${season} clean` : `${season} offset`] ??= { right: 0, strongRight: 0, strongWrong: 0, n: 0 });
      r.n++;
      if (a.suggestedOffsetHours === off) r.right++;
      if (a.strong && a.suggestedOffsetHours === off) r.strongRight++;
      if (a.strong && a.suggestedOffsetHours !== off) { r.strongWrong++; if (process.env.V) console.log(key, seed, a.suggestedOffsetHours, a.evidence.scoreAtBest.toFixed(3)); }
    }
  }
}
console.log(JSON.stringify(res));
