import { describe, expect, it } from "vitest";
import { daysFromCivil, parseIsoDate, parseStrictNumber } from "../../src/ingest/fields.ts";
import { daysBetween } from "../../src/core/time/index.ts";
import { newTimestampScratch, parseTimestampString } from "../../src/ingest/timestamp.ts";

describe("parseStrictNumber", () => {
  it.each([["12.5", 12.5], ["-3", -3], [" 7 ", 7], ["1e3", 1000], [".25", 0.25], ["0", 0]])("accepts %s", (text, value) => {
    expect(parseStrictNumber(text, "usage")).toEqual({ ok: true, value });
  });

  it.each([
    ["1,234", /thousands separator/, /1234/],
    ["$12", /currency symbol/, /only the number/],
    ["12abc", /not a number/, /digits/],
    ["NaN", /not a finite number/, /empty/],
    ["12,5", /comma as decimal point/, /12\.5/],
    ["", /not a number/, /digits/],
  ])("rejects %s with a reason and a hint", (text, message, hint) => {
    const r = parseStrictNumber(text, "usage");
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.problem.message).toMatch(message);
      expect(r.problem.hint).toMatch(hint);
    }
  });
});

describe("parseIsoDate", () => {
  it("accepts real days only (2024 is a leap year, 2023 is not — Gregorian rule)", () => {
    expect(parseIsoDate("2024-02-29", "d").ok).toBe(true);
    expect(parseIsoDate("2023-02-29", "d").ok).toBe(false);
    expect(parseIsoDate("2024-2-1", "d").ok).toBe(false);
    expect(parseIsoDate("01/02/2024", "d").ok).toBe(false);
    expect(parseIsoDate("2024-04-31", "d").ok).toBe(false);
  });

  it("counts days like Date.UTC does", () => {
    expect(daysFromCivil(2024, 3, 10)).toBe(Date.UTC(2024, 2, 10) / 86400000);
    expect(daysFromCivil(1969, 12, 31)).toBe(-1);
    expect(daysBetween("2024-02-01", "2024-03-01")).toBe(29);
  });
});

describe("parseTimestampString", () => {
  const ts = newTimestampScratch();
  it("reads wall time and offset", () => {
    expect(parseTimestampString("2024-03-10T02:30:15.5-05:00", ts)).toBe(true);
    expect(ts.wallMs).toBe(Date.UTC(2024, 2, 10, 2, 30, 15, 500));
    expect(ts.offsetMinutes).toBe(-300);
    expect(parseTimestampString("2024-03-10 02:30", ts)).toBe(true);
    expect(Number.isNaN(ts.offsetMinutes)).toBe(true);
    expect(parseTimestampString("2024-03-10T02:30Z", ts) && ts.offsetMinutes === 0).toBe(true);
    expect(parseTimestampString("2024-03-10T02:30+0530", ts) && ts.offsetMinutes === 330).toBe(true);
  });

  it.each(["2024-03-10", "2024-03-10T24:00", "2024-13-01T00:00", "2024-03-10T02:30Q", "2024-03-10T2:30", "10/03/2024 02:30"])(
    "rejects %s",
    (text) => {
      expect(parseTimestampString(text, ts)).toBe(false);
      expect(ts.error).not.toBe("");
    },
  );
});

describe("parseTimestampString reuses the previous day only when all ten date bytes match", () => {
  it("still rejects a bad separator right after a valid timestamp of the same day", () => {
    const ts = newTimestampScratch();
    expect(parseTimestampString("2024-03-10T01:00", ts)).toBe(true);
    expect(parseTimestampString("2024/03/10T01:15", ts)).toBe(false);
    expect(parseTimestampString("2024-03-10T01:30", ts) && ts.wallMs === Date.UTC(2024, 2, 10, 1, 30)).toBe(true);
    expect(parseTimestampString("2024-03-11T00:00", ts) && ts.wallMs === Date.UTC(2024, 2, 11)).toBe(true);
  });
});
