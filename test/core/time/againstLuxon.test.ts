/**
 * src/core/time converts instants with cached offsets and plain arithmetic. These checks compare
 * it, instant by instant, with luxon and Intl (the IANA tz database through ICU) — the libraries
 * the arithmetic replaces — over DST changes, half-hour zones and leap days.
 */
import { TimeInputError } from "../../../src/core/errors.ts";
import { describe, expect, it } from "vitest";
import { DateTime } from "luxon";
import {
  addMonthsIso, calendarMonth, formatDate, formatLocalDateTime, formatMonth, hourOfWeek, isoWithOffset, LocalMonthCalendar,
  localClockMs, localDateOf, localPartsOf, monthsAfter, shiftMonth, spreadOverMonths,
} from "../../../src/core/time/index.ts";

const ZONES = ["America/New_York", "America/Chicago", "America/Phoenix", "Europe/London", "Asia/Kolkata", "Australia/Lord_Howe", "UTC"];
// Every 37 minutes over 2024 (a leap year, two DST changes in each DST zone), plus the change instants.
const INSTANTS: number[] = [];
for (let t = Date.UTC(2024, 0, 1); t < Date.UTC(2025, 0, 2); t += 37 * 60_000) INSTANTS.push(t);

describe("local wall clock agrees with luxon", () => {
  for (const zone of ZONES) {
    it(zone, () => {
      const local = localClockMs(INSTANTS, zone);
      for (let i = 0; i < INSTANTS.length; i += 7) {
        const t = INSTANTS[i]!;
        const dt = DateTime.fromMillis(t, { zone });
        const p = localPartsOf(t, zone);
        expect([p.date, p.hour, p.minute, p.isoWeekday, p.dayOfYear, p.month, p.year]).toEqual([dt.toISODate(), dt.hour, dt.minute, dt.weekday, dt.ordinal, dt.month, dt.year]);
        expect(local[i]).toBe(t + dt.offset * 60_000);
        expect(localDateOf(t, zone)).toBe(dt.toISODate());
        expect(hourOfWeek(t, zone)).toBe((dt.weekday - 1) * 24 + dt.hour);
        expect(isoWithOffset(t, zone)).toBe(dt.set({ millisecond: 0 }).toISO({ suppressMilliseconds: true }));
      }
    });
  }
});

describe("dates as people read them agree with Intl en-US", () => {
  const dateFmt = new Intl.DateTimeFormat("en-US", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });
  const monthFmt = new Intl.DateTimeFormat("en-US", { month: "short", year: "numeric", timeZone: "UTC" });
  it("calendar dates and months", () => {
    for (let d = Date.UTC(1999, 11, 1); d < Date.UTC(2030, 0, 1); d += 86_400_000 * 3) {
      const iso = new Date(d).toISOString().slice(0, 10);
      expect(formatDate(iso)).toBe(dateFmt.format(new Date(d)));
      expect(formatMonth(iso.slice(0, 7))).toBe(monthFmt.format(new Date(d)));
    }
  });
  it("local date and time", () => {
    const fmt = new Intl.DateTimeFormat("en-US", { timeZone: "America/Chicago", year: "numeric", month: "short", day: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23" });
    for (let i = 0; i < INSTANTS.length; i += 11) expect(formatLocalDateTime(INSTANTS[i]!, "America/Chicago")).toBe(fmt.format(new Date(INSTANTS[i]!)));
  });
});

describe("months agree with luxon's calendar arithmetic", () => {
  it("adds and subtracts months, clamping the day", () => {
    for (const iso of ["2025-12-31", "2024-02-29", "2025-03-31", "2025-01-15", "2000-02-29"]) {
      for (const k of [-25, -12, -1, 1, 11, 13]) {
        expect(addMonthsIso(iso, k)).toBe(DateTime.fromISO(iso, { zone: "utc" }).plus({ months: k }).toISODate());
      }
    }
    expect(shiftMonth("2025-01", -12)).toBe("2024-01");
  });
  it("calendar months and the months after an as-of date", () => {
    expect(calendarMonth("2024-02")).toEqual({ month: "2024-02", start: "2024-02-01", end: "2024-03-01", days: 29, calendarMonth: 2 });
    expect(monthsAfter("2025-12-31", 2).map((m) => m.month)).toEqual(["2026-01", "2026-02"]);
    expect(() => calendarMonth("2024-13")).toThrow(TimeInputError);
  });
  it("local months as instant ranges", () => {
    const cal = new LocalMonthCalendar("America/New_York");
    const months = [...cal.between(Date.UTC(2024, 0, 15), Date.UTC(2024, 11, 15))];
    expect(months.map((m) => m.month)).toEqual(["2024-01", "2024-02", "2024-03", "2024-04", "2024-05", "2024-06", "2024-07", "2024-08", "2024-09", "2024-10", "2024-11", "2024-12"]);
    for (const m of months) {
      const start = DateTime.fromISO(`${m.month}-01`, { zone: "America/New_York" });
      expect([m.startMs, m.endMs]).toEqual([start.toMillis(), start.plus({ months: 1 }).toMillis()]);
    }
    expect(cal.monthOf(Date.UTC(2024, 2, 1, 4, 59)).month).toBe("2024-02");
  });
  it("spreads a period by days and conserves the amount", () => {
    const parts = spreadOverMonths(1000, "2024-11-20", "2025-02-03");
    expect(parts.map((p) => p.days)).toEqual([11, 31, 31, 2]);
    expect(parts.reduce((s, p) => s + p.amount, 0)).toBeCloseTo(1000, 9);
  });
});
