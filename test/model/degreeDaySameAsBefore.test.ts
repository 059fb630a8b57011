/**
 * CPU work on the degree-day models (issue 17: the leave-one-out and rejection refits of an
 * outlier band take their degree-day columns from one table of the training bills, and the HC
 * search keeps its three best coarse pairs instead of sorting them all, a period of whole hours
 * is sorted as typed values; a fit reads the table's columns at its rows instead of copying
 * them, and a one-slope search sums each column without keeping its centred values) must not
 * move a single bit: on random hours, temperature profiles
 * are the same; on random bills, fitDegreeDayModel and degreeDayOutlierBand give exactly the forms,
 * bases, coefficients, statistics, bands and rejections of the code before it
 * (test/model/former/, verbatim copies of commit daa4bc8). Tolerance: none (Object.is on every number).
 */
import { describe, expect, it } from "vitest";
import { sameBits as same } from "./sameBits.ts";
import fc from "fast-check";
import { fitDegreeDayModel, temperatureProfileFromHourly, type DegreeDayPeriod } from "../../src/model/degreeDayRegression.ts";
import { degreeDayOutlierBand, type DegreeDayBandBill } from "../../src/model/outlierBand.ts";
import { fitDegreeDayModel as formerFitDegreeDayModel, temperatureProfileFromHourly as formerProfile } from "./former/degreeDayRegression.ts";
import { degreeDayOutlierBand as formerDegreeDayOutlierBand } from "./former/outlierBand.ts";
import { mulberry32 } from "../../src/core/random.ts";

/** Monthly bills over `months` months of a seasonal climate; use = base + heating + cooling + noise, with a few leaks. */
function bills(seed: number, months: number, heat: number, cool: number, noise: number, leaks: number): DegreeDayBandBill[] {
  const rand = mulberry32(seed);
  return Array.from({ length: months }, (_, m) => {
    const days = 28 + Math.floor(rand() * 6);
    const season = 12 - 14 * Math.cos((2 * Math.PI * (m + 0.5)) / 12);
    const temps = Array.from({ length: days * 24 }, (_, h) => season + 6 * Math.sin((2 * Math.PI * h) / 24) + (rand() - 0.5) * 8);
    const profile = temperatureProfileFromHourly(temps);
    let hdd = 0;
    let cdd = 0;
    for (const t of temps) {
      hdd += Math.max(0, 15 - t);
      cdd += Math.max(0, t - 20);
    }
    let use = 100 + (heat * hdd) / temps.length + (cool * cdd) / temps.length + (rand() - 0.5) * noise;
    if (m < leaks) use *= 1.6;
    return { id: `B${m}`, profile, usePerDay: Math.max(0, use), days };
  });
}

const period = (b: DegreeDayBandBill): DegreeDayPeriod => b;

describe("degree-day models give the former code's numbers bit for bit", () => {
  it("form selection and leave-one-out bands with rejection, on random bills", () => {
    fc.assert(
      fc.property(
        fc.record({
          seed: fc.integer({ min: 1, max: 1 << 30 }),
          months: fc.integer({ min: 4, max: 40 }),
          heat: fc.constantFrom(0, 3, 20),
          cool: fc.constantFrom(0, 5, 30),
          noise: fc.constantFrom(0, 5, 40),
          leaks: fc.constantFrom(0, 1, 3),
          unit: fc.constantFrom("C" as const, "F" as const),
        }),
        (r) => {
          const train = bills(r.seed, r.months, r.heat, r.cool, r.noise, r.leaks);
          const targets = [...train, ...bills(r.seed + 1, 3, r.heat, r.cool, r.noise, 0).map((b) => ({ ...b, id: `T-${b.id}` }))];
          const options = { tempUnit: r.unit };
          expect(same(fitDegreeDayModel(train.map(period), options), formerFitDegreeDayModel(train.map(period), options))).toBe(true);
          // bandOf (a further bill's band) is new; test/model/expectedUsageForStretch.test.ts checks it
          const { bandOf: _bandOf, ...band } = degreeDayOutlierBand(train, targets, options);
          expect(same(band, formerDegreeDayOutlierBand(train, targets, options))).toBe(true);
        },
      ),
      { numRuns: 40, seed: 17 },
    );
  });

  it("temperature profiles of random hours (ties, ±0, NaN, equal and unequal weights)", () => {
    const temp = fc.oneof(fc.constantFrom(0, -0, 1.5, -3, 10, Number.NaN), fc.double({ min: -40, max: 45, noNaN: true }));
    fc.assert(
      fc.property(
        fc.array(temp, { maxLength: 200 }),
        fc.constantFrom("none", "ones", "equal", "edges", "random"),
        fc.integer({ min: 1, max: 1 << 30 }),
        (temps, kind, seed) => {
          const rand = mulberry32(seed);
          const weights =
            kind === "none"
              ? undefined
              : temps.map((_, i) =>
                  kind === "ones" ? 1 : kind === "equal" ? 0.75 : kind === "edges" ? (i === 0 || i === temps.length - 1 ? 0.5 : 1) : Math.floor(rand() * 3) / 2,
                );
          expect(same(temperatureProfileFromHourly(temps, weights), formerProfile(temps, weights))).toBe(true);
        },
      ),
      { numRuns: 400, seed: 17 },
    );
  });
});
