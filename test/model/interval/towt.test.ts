import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { DEFAULT_TOWT_KNOTS_C, fitTowt, selectKnots } from "../../../src/model/interval/towt.ts";

interface TowtCase {
  name: string;
  minPointsPerSegment: number;
  occupancyThreshold: number;
  hourOfWeek: number[];
  holiday: number[];
  tempC: number[];
  kwh: number[];
  expected: {
    occupied: number[];
    knotsOccupiedC: number[];
    knotsUnoccupiedC: number[];
    useHoliday: boolean;
    coefficients: number[];
    standardErrors: number[];
    residualStdError: number;
    fitted: number[];
  };
}
const fixture = JSON.parse(
  readFileSync(new URL("../../fixtures/reference/interval-towt.json", import.meta.url), "utf8"),
) as { knotsC: number[]; cases: TowtCase[] };

function expectRel(got: number, want: number, rel: number, label: string): void {
  expect(Math.abs(got - want), `${label}: got ${got}, want ${want}`).toBeLessThanOrEqual(rel * Math.max(Math.abs(want), 1));
}

describe("TOWT against statsmodels OLS (scripts/reference/make_interval_fixtures.py)", () => {
  it("uses the same °C knots as the reference (40–80 °F converted)", () => {
    expect([...DEFAULT_TOWT_KNOTS_C]).toEqual(fixture.knotsC);
  });
  expect(fixture.cases.map((c) => c.name)).toEqual(["six-weeks-wide-range", "four-weeks-cold"]);
  for (const c of fixture.cases) {
    it(`${c.name} (within solver): coefficients, s and temperature-term SEs match to 1e-8`, () => {
      const m = fitTowt(c, { minPointsPerSegment: c.minPointsPerSegment, occupancyThreshold: c.occupancyThreshold });
      const e = c.expected;
      expect(m.solver).toBe("within");
      expect(Array.from(m.occupied)).toEqual(e.occupied);
      expect(m.coefficients.length).toBe(e.coefficients.length);
      // Frisch–Waugh–Lovell is exact algebra; both sides use orthogonal factorizations
      e.coefficients.forEach((v, j) => expectRel(m.coefficients[j]!, v, 1e-8, `beta ${m.columnNames[j]}`));
      expectRel(m.residualStdError, e.residualStdError, 1e-8, "s");
      const nHow = m.columnNames.filter((n) => n.startsWith("how")).length;
      e.standardErrors.slice(nHow).forEach((v, j) => expectRel(m.standardErrors[nHow + j]!, v, 1e-8, `se ${m.columnNames[nHow + j]}`));
      expect(m.parameterCount).toBe(e.coefficients.length);
    });

    it(`${c.name} (full solver): occupancy, knots and coefficients match to 1e-8`, () => {
      const m = fitTowt(c, { minPointsPerSegment: c.minPointsPerSegment, occupancyThreshold: c.occupancyThreshold, solver: "full" });
      const e = c.expected;
      expect(Array.from(m.occupied)).toEqual(e.occupied);
      expect(m.knotsOccupiedC).toEqual(e.knotsOccupiedC);
      expect(m.knotsUnoccupiedC).toEqual(e.knotsUnoccupiedC);
      expect(m.columnNames.includes("holidayOccupied")).toBe(e.useHoliday);
      expect(m.ols.coefficients.length).toBe(e.coefficients.length);
      // 1e-8 relative (floor 1 for coefficients near 0): both sides solve the same
      // well-conditioned least-squares problem by orthogonal factorizations in double precision.
      e.coefficients.forEach((v, j) => expectRel(m.ols.coefficients[j]!, v, 1e-8, `beta ${m.columnNames[j]}`));
      e.standardErrors.forEach((v, j) => expectRel(m.ols.standardErrors[j]!, v, 1e-8, `se ${m.columnNames[j]}`));
      expectRel(m.ols.residualStdError, e.residualStdError, 1e-8, "s");
      const pred = m.predict({
        ...c,
        hourStartMs: new Float64Array(c.kwh.length),
        hourOfWeek: Uint8Array.from(c.hourOfWeek),
        holiday: Uint8Array.from(c.holiday),
        tempC: Float64Array.from(c.tempC),
        tempSmoothC: Float64Array.from(c.tempC),
        tempSlopeCPerHour: new Float64Array(c.kwh.length),
        tempLagC: Float64Array.from(c.tempC),
        tempRollingMeanC: Float64Array.from(c.tempC),
        dayOfYear: new Uint16Array(c.kwh.length).fill(1),
        month: new Uint8Array(c.kwh.length).fill(1),
      });
      e.fitted.forEach((v, i) => expectRel(pred[i]!, v, 1e-8, `fitted ${i}`));
      expect(m.parameterCount).toBe(e.coefficients.length);
    });
  }
});

describe("TOWT recovers a known hourly pattern (invented data)", () => {
  it("finds the weekday 8–18 h occupancy and the hour-of-week levels without noise", () => {
    const weeks = 5;
    const n = 168 * weeks;
    const how: number[] = [];
    const temp: number[] = [];
    const y: number[] = [];
    const level = (h: number): number => {
      const dow = Math.floor(h / 24);
      const hod = h % 24;
      return dow < 5 && hod >= 8 && hod < 18 ? 50 + hod : 10 + (hod % 3);
    };
    for (let i = 0; i < n; i++) {
      const h = i % 168;
      // deterministic temperature wander covering all knots (−5 … 32 °C)
      const t = 13.5 + 18 * Math.sin(i / 97) * Math.cos(i / 311);
      how.push(h);
      temp.push(t);
      const occ = Math.floor(h / 24) < 5 && h % 24 >= 8 && h % 24 < 18;
      y.push(level(h) + (occ ? 2.0 : 0.5) * Math.max(t - 20, 0));
    }
    // a knot at 20 °C lets the piecewise-linear term represent max(t − 20, 0) exactly
    const m = fitTowt({ hourOfWeek: how, holiday: new Array(n).fill(0), tempC: temp, kwh: y }, { knotsC: [5, 10, 20, 25] });
    for (let h = 0; h < 168; h++) {
      const occ = Math.floor(h / 24) < 5 && h % 24 >= 8 && h % 24 < 18;
      expect(m.occupied[h], `hour ${h}`).toBe(occ ? 1 : 0);
    }
    // exact model → residuals at rounding level
    const maxResid = Math.max(...Array.from(m.ols.residuals, Math.abs));
    expect(maxResid).toBeLessThan(1e-8);
  });

  it("selectKnots drops knots with thin segments (hand-computed)", () => {
    // segment 10–20 is empty → its left knot (10) goes
    expect(selectKnots([1, 2, 3, 30], [10, 20], 1)).toEqual([20]);
    expect(selectKnots([1, 2, 3, 4], [10, 20], 1)).toEqual([]);
    expect(selectKnots([5, 15, 25], [10, 20], 1)).toEqual([10, 20]);
  });

  it("rejects a wrong-length occupancy", () => {
    expect(() => fitTowt({ hourOfWeek: [0, 1], holiday: [0, 0], tempC: [1, 2], kwh: [1, 2] }, { occupancy: [1] })).toThrow(/168/);
  });
});
