/** The fast local calendar agrees with Luxon's own zone conversion (the reference here). */
import fc from "fast-check";
import { DateTime } from "luxon";
import { describe, expect, it } from "vitest";
import { matchPeriod } from "../../src/tariff/calendar.ts";
import { localTimes } from "../../src/core/time/index.ts";
import type { Period } from "../../src/tariff/model.ts";

describe("localTimes", () => {
  it("matches Luxon for sorted 15-minute runs in zones with DST, half-hour offsets and southern seasons", () => {
    fc.assert(
      fc.property(
        fc.constantFrom("America/New_York", "Europe/London", "Australia/Sydney", "America/St_Johns", "Asia/Kolkata", "Pacific/Chatham", "UTC"),
        fc.integer({ min: Date.UTC(2015, 0, 1) / 900_000, max: Date.UTC(2035, 0, 1) / 900_000 }),
        fc.integer({ min: 1, max: 3000 }),
        (zone, startQuarter, n) => {
          const startMs = Float64Array.from({ length: n }, (_, i) => (startQuarter + i) * 900_000);
          const lt = localTimes(startMs, zone);
          for (let i = 0; i < n; i += 37) {
            const ref = DateTime.fromMillis(startMs[i], { zone });
            const day = lt.days[lt.dayIndex[i]];
            expect(day.date).toBe(ref.toISODate());
            expect(day.isoWeekday).toBe(ref.weekday);
            expect(day.month).toBe(ref.month);
            expect(lt.minuteOfDay[i]).toBe(ref.hour * 60 + ref.minute);
          }
        },
      ),
      { numRuns: 60 },
    );
  });

  it("handles unsorted instants", () => {
    const a = Date.UTC(2024, 10, 3, 5, 30); // 01:30 EST (second pass) in New York
    const b = Date.UTC(2024, 10, 3, 4, 30); // 00:30 EDT
    const lt = localTimes(Float64Array.of(a, b), "America/New_York");
    expect([lt.minuteOfDay[0], lt.minuteOfDay[1]]).toEqual([90, 30]);
  });
});

describe("matchPeriod", () => {
  const periods: Period[] = [
    { name: "night", season: null, days: "all", hours: [{ startMin: 22 * 60, endMin: 6 * 60 }], catchAll: false },
    { name: "peak", season: "summer", days: "weekdays", hours: [{ startMin: 14 * 60, endMin: 19 * 60 }], catchAll: false },
    { name: "rest", season: null, days: "all", hours: null, catchAll: true },
  ];
  const seasons = [{ name: "summer", months: [6, 7, 8, 9] }];
  it("wrapping hours, end exclusive, first match wins, season and day filters", () => {
    expect(matchPeriod(periods, seasons, 7, true, 23 * 60)).toBe(0); // 23:00 in a wrapping range
    expect(matchPeriod(periods, seasons, 7, true, 5 * 60 + 59)).toBe(0);
    expect(matchPeriod(periods, seasons, 7, true, 6 * 60)).toBe(2); // 06:00 is the exclusive end
    expect(matchPeriod(periods, seasons, 7, true, 14 * 60)).toBe(1);
    expect(matchPeriod(periods, seasons, 7, true, 19 * 60)).toBe(2);
    expect(matchPeriod(periods, seasons, 7, false, 15 * 60)).toBe(2); // weekend / holiday
    expect(matchPeriod(periods, seasons, 12, true, 15 * 60)).toBe(2); // not summer
  });
});
