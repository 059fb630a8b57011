/**
 * Cleaning-stage benchmark (a script, not a test): `npx tsx bench/cleaning.ts`.
 * Runs the anomaly detectors and the meter–weather alignment scan on a year of synthetic
 * 15-minute office data (the seeded generator the cleaning tests use) and reports the time per
 * meter once warm, and the implied time for a 100-meter portfolio.
 */
import { detectAnomalies } from "../src/clean/detect/index.ts";
import { suggestAlignment } from "../src/clean/alignment.ts";
import { makeOffice, ZONE } from "../test/clean/detect/syntheticOffice.ts";

const REPEAT = 5;
const { series, weather } = makeOffice({ weeks: 52, seed: 11 });

function time(label: string, fn: () => void): number {
  fn(); // warm-up: JIT and zone data
  const runs: number[] = [];
  for (let i = 0; i < REPEAT; i++) {
    const t0 = process.cpuUsage();
    fn();
    const d = process.cpuUsage(t0);
    runs.push((d.user + d.system) / 1000);
  }
  const best = Math.min(...runs);
  console.log(`${label.padEnd(34)} ${best.toFixed(1).padStart(8)} ms CPU per meter   ${((best * 100) / 1000).toFixed(2).padStart(6)} s per 100 meters`);
  return best;
}

console.log(`cleaning benchmark: ${series.values.length} intervals (one year of 15-minute data), best of ${REPEAT}`);
let mask: Uint8Array = new Uint8Array(series.values.length);
const detect = time("detectAnomalies", () => {
  mask = detectAnomalies(series, {}, { timezone: ZONE }).mask;
});
const align = time("suggestAlignment (±14 h scan)", () => void suggestAlignment(series, weather, ZONE, { mask }));
console.log(`alignment / detection time ratio: ${(align / detect).toFixed(2)}`);
