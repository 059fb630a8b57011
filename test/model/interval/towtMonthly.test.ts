import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { fitTowtMonthly, segmentWeight, towtMonthlySpec, type TowtMonthlySegmentFits } from "../../../src/model/interval/towtMonthly.ts";
import { fitTowt, towtSpec } from "../../../src/model/interval/towt.ts";
import { selectFrameRows } from "../../../src/model/interval/hourlyFrame.ts";
import { rmse, schoolYear } from "./syntheticSchool.ts";

describe("three-month weighted segments (CalTRACK hourly segmentation, from memory; hand-computed)", () => {
  it("weights the month 1, its neighbours ½ (December and January are neighbours), others 0", () => {
    expect([segmentWeight(7, 7, 0.5), segmentWeight(7, 6, 0.5), segmentWeight(7, 8, 0.5), segmentWeight(7, 9, 0.5)]).toEqual([1, 0.5, 0.5, 0]);
    expect([segmentWeight(1, 12, 0.5), segmentWeight(12, 1, 0.5), segmentWeight(1, 11, 0.5)]).toEqual([0.5, 0.5, 0]);
  });
});

describe("weighted TOWT (common practice: integer weights equal repeated rows in least squares)", () => {
  it("weight 2 on a row gives the same coefficients as the row twice, for both solvers", () => {
    const f = schoolYear(2021, 3);
    const rows = Array.from({ length: 24 * 56 }, (_, i) => i); // January–February
    const base = selectFrameRows(f, rows);
    const doubled = selectFrameRows(f, [...rows, ...rows.filter((i) => i % 3 === 0)]);
    const w = rows.map((i) => (i % 3 === 0 ? 2 : 1));
    for (const solver of ["within", "full"] as const) {
      const a = fitTowt({ ...base, weights: w }, { solver, occupancyThreshold: 0.65 });
      const b = fitTowt(doubled, { solver, occupancyThreshold: 0.65 });
      expect(Array.from(a.occupied)).toEqual(Array.from(b.occupied));
      a.coefficients.forEach((c, j) => expect(c).toBeCloseTo(b.coefficients[j]!, 8));
    }
  });
});

describe("month-segmented TOWT (invented school-like data)", () => {
  const year1 = schoolYear(2021, 1);
  const year2 = schoolYear(2022, 2);
  const july = Array.from({ length: 31 * 24 }, (_, i) => 181 * 24 + i); // 1–31 July (non-leap year)
  const inJuly = (p: Float64Array): number[] => july.map((i) => p[i]!);
  const y2July = july.map((i) => year2.kwh[i]!);

  it("learns the summer break from one year and predicts it in July of the next; plain TOWT cannot", () => {
    const monthly = towtMonthlySpec().fit(year1).predict(year2);
    const plain = towtSpec().fit(year1).predict(year2);
    // Break working hours (a quarter of July's hours) use 9 instead of 60 kWh. Plain TOWT has one
    // level per hour of week for the whole year; part of the step hides in its occupied
    // temperature slope (summer is warm), but it stays several kWh off (rmse > 5). The
    // segmented model sees July itself: what is left is noise, ≈ 1–2 kWh.
    expect(rmse(y2July, inJuly(plain))).toBeGreaterThan(5);
    expect(rmse(y2July, inJuly(monthly))).toBeLessThan(3);
    expect(rmse(year2.kwh, monthly)).toBeLessThan(rmse(year2.kwh, plain));
  });

  it("months without enough weighted hours fall back to the all-hours fit (January–February only: April … November)", () => {
    // Jan 744 h, Feb 672 h. Weighted hours: Mar ½·672 = 336 ≥ 336, Dec ½·744 = 372: segments;
    // April … November have none.
    const m = fitTowtMonthly(selectFrameRows(year1, Array.from({ length: 59 * 24 }, (_, i) => i)));
    expect(m.fallbackMonths).toEqual([4, 5, 6, 7, 8, 9, 10, 11]);
    expect(m.byMonth[5]).toBe(m.byMonth[6]);
    expect(m.byMonth[0]).not.toBe(m.byMonth[5]);
    expect(m.parameterCount).toBe(Math.max(...m.byMonth.map((b) => b.parameterCount)));
  });
});

describe("month-segmented predictions (definition: each hour from its month's TOWT)", () => {
  it("every hour's prediction is, bit for bit, its month's model's prediction of the whole table there", () => {
    const train = schoolYear(2021, 5);
    const other = schoolYear(2022, 6);
    other.tempC[100] = Number.NaN; // no temperature, no prediction
    const m = fitTowtMonthly(train);
    const got = m.predict(other);
    const byMonth = m.byMonth.map((b) => b.predict(other));
    for (let i = 0; i < got.length; i++) expect(Object.is(got[i], byMonth[other.month[i]! - 1]![i])).toBe(true);
    expect(Number.isNaN(got[100]!)).toBe(true);
  });
});

describe("a fold's table reuses its frame's segment fits where its months lost no row", () => {
  // The reference is the same fold table fitted from scratch (no kept fits): every segment
  // fitted on its own. Equal bit for bit.
  const frame = schoolYear(2021, 4);
  const same = (a: Float64Array, b: Float64Array): void => expect(Array.from(a)).toEqual(Array.from(b));
  it("blocked and expanding folds, any block: same months fallen back, same predictions", () => {
    const kept: TowtMonthlySegmentFits = new WeakMap();
    const whole = fitTowtMonthly(frame, {}, kept);
    const n = frame.kwh.length;
    fc.assert(
      fc.property(fc.integer({ min: 0, max: n - 1 }), fc.integer({ min: 1, max: 24 * 75 }), fc.boolean(), (start, len, expanding) => {
        if (expanding && start < 24 * 14) return; // a fold trains on at least two weeks (timeSeriesCv)
        const end = Math.min(n, start + len);
        const rows = Array.from({ length: n }, (_, i) => i).filter((i) => i < start || (!expanding && i >= end));
        const fold = selectFrameRows(frame, rows);
        const reused = fitTowtMonthly(fold, {}, kept);
        const fresh = fitTowtMonthly(fold);
        expect(reused.fallbackMonths).toEqual(fresh.fallbackMonths);
        expect(reused.parameterCount).toBe(fresh.parameterCount);
        reused.byMonth.forEach((m, k) => expect(m.coefficients).toEqual(fresh.byMonth[k]!.coefficients));
        same(reused.predict(frame), fresh.predict(frame));
        // and months the block did not touch are the frame's own fits
        const touched = new Set(Array.from(frame.month.subarray(start, expanding ? n : end)));
        for (let m = 1; m <= 12; m++) {
          const near = [m, (m % 12) + 1, ((m + 10) % 12) + 1];
          if (!near.some((k) => touched.has(k)) && !whole.fallbackMonths.includes(m)) expect(reused.byMonth[m - 1]).toBe(whole.byMonth[m - 1]);
        }
      }),
      { numRuns: 8, examples: [[0, 1, true]] },
    );
  });
});
