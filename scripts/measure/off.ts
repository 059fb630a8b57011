import { suggestAlignment } from "../../src/clean/alignment.ts";
import { makeOffice, shiftStamps, ZONE } from "../../test/clean/detect/syntheticOffice.ts";
for (const seed of [42, 1, 2, 3]) {
  const { series, weather } = makeOffice({ seed });
  for (const off of [0, 3]) {
    const a = suggestAlignment(shiftStamps(series, off), weather, ZONE);
    console.log(seed, off, a.suggestedOffsetHours, a.strong, a.evidence.margin.toFixed(3), a.evidence.jackknifeAgreeing, a.evidence.jackknifeRuns, a.evidence.note);
  }
}
