import { makeMeter, makeYearWeather } from "../../test/clean/detect/syntheticMeters.ts";
const w = makeYearWeather(1);
const s = makeMeter("coarse-night", 1, w);
const v = s.values;
const hist: Record<number, number> = {};
let i = 0;
while (i < v.length) { let j = i + 1; while (j < v.length && v[j] === v[i]) j++; if (v[i] !== 0 && j - i >= 8) hist[Math.min(j - i, 60)] = (hist[Math.min(j - i, 60)] ?? 0) + 1; i = j; }
console.log(hist, Array.from(v.slice(0, 40)).join(" "));
