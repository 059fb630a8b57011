/**
 * CPU work on the hourly feature table (issue 17: the local clock read once per hour and the
 * calendar worked out once per local day) must not change it: on random hours in zones with and
 * without daylight saving (whole, half and three-quarter hour offsets, a 30-minute DST shift),
 * sorted or not, hourlyFeaturesAt gives exactly the former code's table
 * (test/model/interval/former/hourlyFeatures.ts, a verbatim copy of commit daa4bc8), and the same
 * error for a non-finite hour or an unknown zone. Tolerance: none (Object.is on every number).
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { hourlyFeaturesAt } from "../../../src/model/interval/hourlyFeatures.ts";
import { hourlyFeaturesAt as former } from "./former/hourlyFeatures.ts";
import type { WeatherSeries } from "../../../src/domain/types.ts";
import { mulberry32 } from "../../../src/core/random.ts";

const HOUR = 3_600_000;
const START = Date.UTC(2023, 0, 1);

function weather(seed: number): WeatherSeries {
  const rand = mulberry32(seed);
  const tempC = Float64Array.from({ length: 3 * 8760 }, (_, i) => (rand() < 0.01 ? Number.NaN : 10 + 12 * Math.sin((2 * Math.PI * i) / 8760) + 5 * Math.sin((2 * Math.PI * i) / 24) + rand()));
  return { stationId: "W", startMs: START, tempC, filled: new Uint8Array(tempC.length) };
}

const same = (a: ArrayLike<number>, b: ArrayLike<number>): boolean => a.length === b.length && Array.from(a).every((v, i) => Object.is(v, b[i]));

function outcome(f: () => ReturnType<typeof hourlyFeaturesAt>): unknown {
  try {
    return f();
  } catch (e) {
    return { error: (e as Error).constructor.name, message: (e as Error).message };
  }
}

describe("hourlyFeaturesAt gives the former code's table bit for bit", () => {
  const w = weather(7);
  it("on random hours and zones", () => {
    fc.assert(
      fc.property(
        fc.constantFrom("America/New_York", "Europe/London", "Asia/Kolkata", "Asia/Kathmandu", "Australia/Lord_Howe", "UTC", "America/Phoenix", "Pacific/Chatham"),
        fc.integer({ min: -200, max: 3 * 8760 }),
        fc.integer({ min: 0, max: 3000 }),
        fc.constantFrom("sorted", "shuffled", "minutes"),
        fc.integer({ min: 1, max: 1 << 30 }),
        (zone, first, length, order, seed) => {
          const rand = mulberry32(seed);
          let hours = Array.from({ length }, (_, k) => START + (first + k) * HOUR);
          if (order === "shuffled") hours = hours.map((h) => ({ h, r: rand() })).sort((a, b) => a.r - b.r).map((x) => x.h);
          if (order === "minutes") hours = hours.map((h) => h + Math.floor(rand() * 60) * 60_000);
          const a = hourlyFeaturesAt(w, zone, hours);
          const b = former(w, zone, hours);
          expect(a.derivedFallbacks).toBe(b.derivedFallbacks);
          for (const key of Object.keys(b.features) as (keyof typeof b.features)[]) {
            const x = a.features[key];
            const y = b.features[key];
            expect(x === undefined ? y === undefined : same(x as ArrayLike<number>, y as ArrayLike<number>)).toBe(true);
          }
        },
      ),
      { numRuns: 120, seed: 17 },
    );
  });
  it("with the same error for a non-finite hour and an unknown zone", () => {
    for (const [zone, hours] of [["America/New_York", [START, Number.NaN]], ["Not/AZone", [START]]] as const) {
      const now = outcome(() => hourlyFeaturesAt(w, zone, hours));
      expect(now).toMatchObject({ error: "ModelInputError" });
      expect(now).toEqual(outcome(() => former(w, zone, hours)));
    }
  });
});
