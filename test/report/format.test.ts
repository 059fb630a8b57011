import { TimeInputError } from "../../src/core/errors.ts";
import { describe, expect, it } from "vitest";
import {
  NOT_AVAILABLE,
  formatDate,
  formatMoney,
  formatMoneySigned,
  formatMonth,
  formatNumber,
  formatPeriod,
  formatQuantity,
  formatRate,
  jsonForScript,
} from "../../src/report/format.ts";

// Expected strings are the en-US conventions of the Unicode CLDR data that ECMA-402 Intl uses
// (common practice: "$1,234.50", "Jan 31, 2025"); hand-written, not produced by the code under test.
describe("money", () => {
  it("formats in the portfolio currency with two decimals", () => {
    expect(formatMoney(1234.5, "USD")).toBe("$1,234.50");
    expect(formatMoney(0.005, "USD")).toBe("$0.01");
    expect(formatMoney(-0, "USD")).toBe("$0.00");
    expect(formatMoney(99, "EUR")).toBe("€99.00");
    expect(formatMoney(1000, "CAD")).toBe("CA$1,000.00");
  });
  it("degrades to number + code when the currency code is unusable, never throwing", () => {
    expect(formatMoney(1234.5, "DOLLARS")).toBe("1,234.50 DOLLARS");
    expect(formatRate(0.1, "DOLLARS", "kWh")).toBe("0.10 DOLLARS per kWh");
  });
  it("gives differences an explicit sign and no negative zero", () => {
    expect(formatMoneySigned(12.34, "USD")).toBe("+\u2060$12.34");
    expect(formatMoneySigned(-3, "USD")).toBe("−\u2060$3.00");
    expect(formatMoneySigned(-0.001, "USD")).toBe("$0.00");
  });
  // Unicode Standard Annex #14 (line breaking): "+", "−" (U+2212), "-" before "$" and "$" itself
  // are prefix characters (class PR, HY), and nothing in the algorithm forbids a break between
  // two of them, so a narrow cell may end a line with the sign and start the next with "$4.50";
  // U+2060 WORD JOINER (class WJ) forbids a break on either side (rule LB11).
  it("joins a sign to the currency symbol so no line break can separate them", () => {
    for (const text of [formatMoneySigned(4.5, "USD"), formatMoneySigned(-4.5, "USD"), formatMoney(-4.5, "USD"), formatRate(-0.01, "USD", "kWh")]) {
      expect(text).toMatch(/^[+−-]\u2060\$/);
      expect(text.replace("\u2060", "")).toMatch(/^[+−-]\$\d/);
    }
    expect(formatMoney(-4.5, "USD")).toBe("-\u2060$4.50");
    expect(formatMoney(4.5, "USD")).toBe("$4.50");
  });
  it("shows rates with up to six decimals", () => {
    expect(formatRate(0.123456, "USD", "kWh")).toBe("$0.123456 per kWh");
    expect(formatRate(9.5, "USD", "kW")).toBe("$9.50 per kW");
  });
});

describe("numbers never print NaN", () => {
  it("uses a placeholder for missing or non-finite values", () => {
    for (const v of [NaN, Infinity, -Infinity, null, undefined]) {
      expect(formatMoney(v, "USD")).toBe(NOT_AVAILABLE);
      expect(formatNumber(v)).toBe(NOT_AVAILABLE);
      expect(formatQuantity(v, "kWh")).toBe(NOT_AVAILABLE);
    }
  });
  it("chooses decimals by size", () => {
    expect(formatQuantity(12345.6, "kWh")).toBe("12,346 kWh");
    expect(formatQuantity(3.456, "kW")).toBe("3.46 kW");
    expect(formatQuantity(0.12345, "therm")).toBe("0.1235 therm");
  });
});

describe("dates", () => {
  it("formats calendar days without any time zone shift", () => {
    expect(formatDate("2025-01-31")).toBe("Jan 31, 2025");
    expect(formatDate("2024-02-29")).toBe("Feb 29, 2024");
    expect(formatMonth("2025-03")).toBe("Mar 2025");
  });
  it("shows a half-open period with its last day of service", () => {
    expect(formatPeriod("2025-01-01", "2025-02-01")).toBe("Jan 1, 2025 – Jan 31, 2025");
    expect(formatPeriod("2024-02-05", "2024-03-05")).toBe("Feb 5, 2024 – Mar 4, 2024");
  });
  it("rejects malformed dates instead of printing Invalid Date", () => {
    expect(() => formatDate("2025/01/31")).toThrow(TimeInputError);
  });
});

describe("jsonForScript", () => {
  it("escapes < so a string cannot close the script block, and round-trips", () => {
    const value = { title: "</script><script>alert(1)</script>", note: "<!-- x", sep: "a\u2028b" };
    const json = jsonForScript(value);
    expect(json).not.toContain("<");
    expect(json).not.toContain("\u2028");
    expect(JSON.parse(json)).toEqual(value);
  });
});
