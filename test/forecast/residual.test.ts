/** Calendar-month adjustment of the change-point forecast (src/forecast/residual.ts), hand-computed on invented bills. */
import { describe, expect, it } from "vitest";
import type { ChangePointFit } from "../../src/model/changePoint.ts";
import { residualByCalendarMonth } from "../../src/forecast/residual.ts";
import type { WeatherYear } from "../../src/forecast/weatherYears.ts";
import { calendarBills } from "./helpers.ts";

/** ŷ(T) = 100 + 2·T use per day (only predict is read). */
const fit = { predict: (t: number) => 100 + 2 * t } as unknown as ChangePointFit;
/** Every month 10 ° in 2023 and 20 ° in 2024. */
const years: WeatherYear[] = [
  { year: 2023, monthlyTemp: new Array<number>(12).fill(10) },
  { year: 2024, monthlyTemp: new Array<number>(12).fill(20) },
];
// Use per day: 2023 January 130 (ŷ 120 → +10), other months 120 (0); 2024 January 150 (ŷ 140 → +10), July 130 (ŷ 140 → −10), else 140.
const days = (y: number, m: number) => new Date(Date.UTC(y, m, 0)).getUTCDate();
const bills = [
  ...calendarBills(2023, (m) => (m === 1 ? 130 : 120) * days(2023, m), () => 1),
  ...calendarBills(2024, (m) => (m === 1 ? 150 : m === 7 ? 130 : 140) * days(2024, m), () => 1),
].map((b, i) => ({ ...b, billId: `b${i}` }));

describe("residual by calendar month", () => {
  it("none: no adjustment", () => {
    expect(residualByCalendarMonth(fit, bills, years, "2024-12-31", "none")).toBeNull();
  });

  it("all-years: the mean departure from the model per calendar month (January +10, July (0 − 10)/2 = −5)", () => {
    const r = residualByCalendarMonth(fit, bills, years, "2024-12-31", "all-years")!;
    expect(r[0]).toBeCloseTo(10, 10);
    expect(r[6]).toBeCloseTo(-5, 10);
    expect(r[3]).toBeCloseTo(0, 10);
  });

  it("last-year: only the 12 months up to as-of (July −10)", () => {
    const r = residualByCalendarMonth(fit, bills, years, "2024-12-31", "last-year")!;
    expect(r[6]).toBeCloseTo(-10, 10);
    expect(r[0]).toBeCloseTo(10, 10);
  });

  it("bills after as-of and months without temperature are not used", () => {
    const r = residualByCalendarMonth(fit, bills, [years[0]!], "2024-12-31", "all-years")!;
    expect(r[6]).toBeCloseTo(0, 10); // 2024 has no temperature: only 2023's July (0)
    const early = residualByCalendarMonth(fit, bills, years, "2023-12-31", "all-years")!;
    expect(early[0]).toBeCloseTo(10, 10);
    expect(early[6]).toBeCloseTo(0, 10);
  });
});
