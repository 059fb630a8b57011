/**
 * Clock offsets that are right or silent (issue 12, item 7), on invented offices
 * (alignmentSynthetic.ts, seeded) in heating- and cooling-dominated seasons and across a DST
 * change, with thermal lags of 0–4 h. Expected values are the planted offsets themselves
 * (stamped = true + offset), so the sign convention is the one documented in alignment.ts.
 * Why the lag matters: a load that answers the last hours' temperatures peaks in the scan at
 * offset + lag; the distributed-lag onset does not move (common practice in building-energy
 * regression: the response to weather is causal and spread over the following hours).
 */
import { describe, expect, it } from "vitest";
import { suggestAlignment } from "../../src/clean/alignment.ts";
import { ALIGN_ZONE, officeOnStation, seasonWeather, type Season } from "./alignmentSynthetic.ts";

const SEASONS: Season[] = ["cooling", "heating", "dst"];
const OFFSETS = [-5, -4, -3, -2, -1, 0, 1, 2, 3, 4, 5];

describe("offsets −5 … +5 h are recovered", () => {
  for (const season of SEASONS) {
    for (const lagHours of [0, 2]) {
      it(`${season} season, thermal lag ${lagHours} h, seeds 1–2`, () => {
        for (const seed of [1, 2]) {
          const weather = seasonWeather(season, seed);
          for (const offsetHours of OFFSETS) {
            const a = suggestAlignment(officeOnStation(weather, { season, seed, offsetHours, lagHours }), weather, ALIGN_ZONE);
            expect(a.suggestedOffsetHours, `seed ${seed} offset ${offsetHours}: ${a.evidence.note}`).toBe(offsetHours);
            // without a lag every reading agrees, so every one is strong
            if (lagHours === 0) expect(a.strong, `seed ${seed} offset ${offsetHours}`).toBe(true);
          }
        }
      }, 120_000);
    }
  }
});

describe("no strong false claim", () => {
  for (const season of SEASONS) {
    it(`${season} season: thermal lags 0–4 h, seeds 1–4, every offset: strong only when right`, () => {
      for (const seed of [1, 2, 3, 4]) {
        const weather = seasonWeather(season, seed);
        for (const lagHours of [0, 1, 2, 3, 4]) {
          for (const offsetHours of lagHours === 0 ? [0] : OFFSETS) {
            const a = suggestAlignment(officeOnStation(weather, { season, seed, offsetHours, lagHours }), weather, ALIGN_ZONE);
            if (a.strong) expect(a.suggestedOffsetHours, `seed ${seed} lag ${lagHours} offset ${offsetHours}: ${a.evidence.note}`).toBe(offsetHours);
          }
        }
      }
    }, 240_000);
  }

  it("a clean meter whose load lags the weather by 2 h is not called 1 h late (the scan alone did)", () => {
    const weather = seasonWeather("cooling", 1);
    const a = suggestAlignment(officeOnStation(weather, { season: "cooling", seed: 1, offsetHours: 0, lagHours: 2 }), weather, ALIGN_ZONE);
    expect(a.evidence.scanPeakOffsetHours).toBe(1); // the thermal lag moves the scan's peak …
    expect(a.evidence.onsetOffsetHours).toBe(0); // … but not where the response begins
    expect(a.suggestedOffsetHours).toBe(0);
    expect(a.evidence.note).toMatch(/response to temperature begins at 0 h and the scan peaks at 1 h/);
  });
});
