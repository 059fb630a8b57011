import { describe, expect, it } from "vitest";
import { buildZoneCalendar, usFederalHolidays } from "../../scripts/demo/calendar.ts";
import { csvCell, fixed, scaledIntText } from "../../scripts/demo/csv.ts";
import { BUILDINGS, METERS, buildingOf, stationOf } from "../../scripts/demo/definition.ts";
import { MAX_PERIOD_DAYS, MIN_PERIOD_DAYS, readDates } from "../../scripts/demo/read-schedule.ts";
import { daysBetween } from "../../scripts/demo/calendar.ts";

describe("csv helpers", () => {
  it("quotes per RFC 4180 only when needed", () => {
    expect(csvCell('Ash & Elm "Commons" <North>')).toBe('"Ash & Elm ""Commons"" <North>"');
    expect(csvCell("a,b")).toBe('"a,b"');
    expect(csvCell("plain")).toBe("plain");
    expect(csvCell(null)).toBe("");
  });
  it("writes exact decimals from integer counts and never a negative zero", () => {
    expect(scaledIntText(123450, 3)).toBe("123.45");
    expect(scaledIntText(7, 3)).toBe("0.007");
    expect(scaledIntText(5000, 3)).toBe("5");
    expect(scaledIntText(-25, 2)).toBe("-0.25");
    expect(fixed(-0.04, 1)).toBe("0.0");
    expect(fixed(-0.06, 1)).toBe("-0.1");
  });
});

describe("zone calendar", () => {
  // U.S. DST rules (Energy Policy Act of 2005): second Sunday of March, first Sunday of November.
  it("gives the spring DST day 92 intervals and the autumn one 100 with the 01:00 hour repeated", () => {
    const cal = buildZoneCalendar("America/New_York", "2025-03-08", "2025-11-03", new Set());
    const day = (d: string) => cal.days[cal.dayIndex.get(d) as number];
    expect(day("2025-03-09").intervalCount).toBe(92);
    expect(day("2025-11-02").intervalCount).toBe(100);
    expect(day("2025-07-01").intervalCount).toBe(96);
    const nov = day("2025-11-02");
    const minutes = Array.from(cal.clockMinute.slice(nov.firstInterval, nov.firstInterval + nov.intervalCount));
    expect(minutes.filter((m) => m === 60).length).toBe(2);
    const mar = day("2025-03-09");
    const spring = Array.from(cal.clockMinute.slice(mar.firstInterval, mar.firstInterval + mar.intervalCount));
    expect(spring.includes(120)).toBe(false);
  });
});

describe("us federal holidays (5 U.S.C. 6103, observed)", () => {
  it("shifts Saturday to Friday and Sunday to Monday", () => {
    // 2023-01-01 was a Sunday → observed Monday 2023-01-02; 2026-07-04 is a Saturday → Friday 2026-07-03.
    expect(usFederalHolidays(2023)).toContain("2023-01-02");
    expect(usFederalHolidays(2026)).toContain("2026-07-03");
    // Thanksgiving 2025: fourth Thursday of November = 2025-11-27.
    expect(usFederalHolidays(2025)).toContain("2025-11-27");
    expect(usFederalHolidays(2025)).toHaveLength(11);
  });
});

describe("read schedule", () => {
  it("gives 37 reads per meter, periods of 28–33 days, from December 2022 to December 2025", () => {
    for (const m of METERS) {
      const reads = readDates(m.meterId);
      expect(reads).toHaveLength(37);
      expect(reads[0].startsWith("2022-12")).toBe(true);
      expect(reads[36].startsWith("2025-12")).toBe(true);
      for (let i = 1; i < reads.length; i++) {
        const len = daysBetween(reads[i - 1], reads[i]);
        expect(len).toBeGreaterThanOrEqual(MIN_PERIOD_DAYS);
        expect(len).toBeLessThanOrEqual(MAX_PERIOD_DAYS);
      }
    }
  });
});

describe("definition", () => {
  it("links every meter to a building and every building to a station", () => {
    for (const m of METERS) expect(() => stationOf(buildingOf(m))).not.toThrow();
    expect(new Set(BUILDINGS.map((b) => b.useType)).size).toBe(BUILDINGS.length);
    expect(() => buildingOf({ ...METERS[0], buildingId: "nope" })).toThrow(/unknown building/);
  });
});
