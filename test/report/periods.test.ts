import { describe, expect, it } from "vitest";
import { last12MonthsText, prorateToWindow } from "../../src/report/periods.ts";
import type { Bill } from "../../src/domain/types.ts";

const bill = (start: string, end: string): Bill => ({
  billId: "x", meterId: "m", periodStart: start, periodEnd: end, usage: 1, readType: "actual",
  demandKw: null, powerFactor: null, total: 1, statementDate: null, source: { file: "bills.csv", line: 2 },
});

describe("last12MonthsText", () => {
  it("names the per-meter rule and the as-of date", () => {
    expect(last12MonthsText("2025-12-31")).toBe("the 12 months up to each meter's last read, ending no later than Dec 31, 2025");
    expect(last12MonthsText(null)).toBe("no bills");
  });
});

describe("addMonthsIso", () => {
  it("clamps to the month's last day (hand-computed)", () => {
    expect(addMonthsIso("2024-01-31", 1)).toBe("2024-02-29");
    expect(addMonthsIso("2025-03-05", -12)).toBe("2024-03-05");
    expect(addMonthsIso("2025-01-01", -1)).toBe("2024-12-01");
  });
});

describe("proration by days (hand-computed)", () => {
  it("takes the share of days inside the window", () => {
    // 31 days 2025-12-15..2026-01-15, 17 of them in 2025.
    expect(prorateToWindow(310, "2025-12-15", "2026-01-15", { start: "2025-01-01", end: "2026-01-01" })).toBeCloseTo(170, 10);
    expect(prorateToWindow(310, "2026-01-15", "2026-02-15", { start: "2025-01-01", end: "2026-01-01" })).toBe(0);
  });
  it("spreads a period over calendar months and conserves the amount", () => {
    // 2025-01-16..2025-02-17 = 32 days: 16 in January, 16 in February.
    const parts = spreadOverMonths(64, "2025-01-16", "2025-02-17");
    expect(parts).toEqual([{ month: "2025-01", amount: 32, days: 16 }, { month: "2025-02", amount: 32, days: 16 }]);
    const long = spreadOverMonths(1000, "2024-11-20", "2025-02-03");
    expect(long.map((p) => p.month)).toEqual(["2024-11", "2024-12", "2025-01", "2025-02"]);
    expect(long.reduce((s, p) => s + p.amount, 0)).toBeCloseTo(1000, 9);
  });
});

import { partialMonthsNote } from "../../src/report/coverage.ts";
import { addMonthsIso, spreadOverMonths } from "../../src/core/time/index.ts";

describe("partialMonthsNote (hand-computed)", () => {
  it("names edge months that bills cover only in part", () => {
    expect(partialMonthsNote([{ periodStart: "2024-01-05", periodEnd: "2024-02-05" }, { periodStart: "2024-02-05", periodEnd: "2025-03-05" }])).toBe(
      "Jan 2024 and Mar 2025 are only partly covered by bills.",
    );
    expect(partialMonthsNote([{ periodStart: "2024-01-01", periodEnd: "2024-03-01" }])).toBe("");
    expect(partialMonthsNote([{ periodStart: "2024-01-01", periodEnd: "2024-02-15" }])).toBe("Feb 2024 is only partly covered by bills.");
    expect(partialMonthsNote([])).toBe("");
  });
});
