import { describe, expect, it } from "vitest";
import { isUsFederalHoliday, usFederalHolidays } from "../../../src/core/time/index.ts";

// Source: 5 U.S.C. 6103(a) (the list of holidays, Juneteenth added in 2021) and 6103(b)
// (Saturday holiday observed the Friday before, Sunday holiday the Monday after).
describe("usFederalHolidays (5 U.S.C. 6103)", () => {
  it("lists the 2024 observed holidays", () => {
    expect([...usFederalHolidays(2024)].sort()).toEqual([
      "2024-01-01", "2024-01-15", "2024-02-19", "2024-05-27", "2024-06-19", "2024-07-04",
      "2024-09-02", "2024-10-14", "2024-11-11", "2024-11-28", "2024-12-25",
    ]);
  });

  it.each([
    ["2021-07-05", "Independence Day 2021 fell on a Sunday: observed Monday"],
    ["2021-12-24", "Christmas 2021 fell on a Saturday: observed Friday"],
    ["2021-12-31", "New Year's Day 2022 fell on a Saturday: observed Friday Dec 31, 2021"],
    ["2022-06-20", "Juneteenth 2022 fell on a Sunday: observed Monday"],
    ["2023-01-02", "New Year's Day 2023 fell on a Sunday: observed Monday"],
    ["2023-11-10", "Veterans Day 2023 fell on a Saturday: observed Friday"],
    ["2026-07-03", "Independence Day 2026 falls on a Saturday: observed Friday"],
  ])("%s is observed (%s)", (date) => {
    expect(isUsFederalHoliday(date)).toBe(true);
  });

  it("does not list the Saturday/Sunday dates themselves, nor Juneteenth before 2021", () => {
    expect(isUsFederalHoliday("2026-07-04")).toBe(false);
    expect(isUsFederalHoliday("2021-12-25")).toBe(false);
    expect(isUsFederalHoliday("2022-01-01")).toBe(false);
    expect(isUsFederalHoliday("2020-06-19")).toBe(false);
    expect(isUsFederalHoliday("2021-06-18")).toBe(true); // Juneteenth 2021 was a Saturday
  });

  it("every observed holiday is a weekday (property of the observed-date rule)", () => {
    for (let y = 1990; y <= 2060; y++) {
      for (const d of usFederalHolidays(y)) {
        const dow = new Date(`${d}T00:00:00Z`).getUTCDay();
        expect(dow, d).toBeGreaterThanOrEqual(1);
        expect(dow, d).toBeLessThanOrEqual(5);
      }
    }
  });
});
