import { suggestAlignment } from "../../src/clean/alignment.ts";
import { officeOnStation, seasonWeather, ALIGN_ZONE } from "../../test/clean/alignmentSynthetic.ts";
const [season, seed, off, lag] = [process.argv[2] as never, Number(process.argv[3]), Number(process.argv[4]), Number(process.argv[5])];
const w = seasonWeather(season, seed);
const a = suggestAlignment(officeOnStation(w, { season, seed, offsetHours: off, lagHours: lag }), w, ALIGN_ZONE);
console.log("scan", a.suggestedOffsetHours, a.strong);
