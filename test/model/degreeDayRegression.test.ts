import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import fc from "fast-check";
import {
  cddPerDay,
  fitDegreeDayForm,
  fitDegreeDayFormAt,
  fitDegreeDayModel,
  hddPerDay,
  temperatureProfileForPeriod,
  temperatureProfileFromHourly,
  type DegreeDayForm,
  type DegreeDayPeriod,
} from "../../src/model/degreeDayRegression.ts";
import { degreeDaysForPeriod, degreeDaysFromHourly } from "../../src/model/degreeDays.ts";
import { studentTQuantile } from "../../src/model/studentT.ts";
import { ModelInputError } from "../../src/model/errors.ts";

interface DdCase {
  name: string;
  form: DegreeDayForm;
  periods: { temps: number[]; days: number; usePerDay: number }[];
  fixedBases: { heatingBase: number | null; coolingBase: number | null };
  expected: {
    coefficients: number[];
    standardErrors: number[];
    tValues: number[];
    residualStdError: number;
    dfResidual: number;
    sse: number;
    rSquared: number;
    fitted: number[];
    regressors: number[][];
  };
  predictions: { temps: number[]; days: number; level: number; fit: number; seMean: number; lower: number; upper: number }[];
  searched?: { base: number; sse: number; range: [number, number] };
}
const fixture = JSON.parse(readFileSync(new URL("../fixtures/reference/degree-day-regression.json", import.meta.url), "utf8")) as { cases: DdCase[] };
const periodsOf = (c: DdCase): DegreeDayPeriod[] =>
  c.periods.map((p) => ({ profile: temperatureProfileFromHourly(p.temps), days: p.days, usePerDay: p.usePerDay }));
const rel = (got: number, want: number): number => Math.abs(got - want) / Math.max(Math.abs(want), 1e-12);

describe("degree-days per day from the sorted profile", () => {
  it("hand-computed (project references): 12 h at 60 °F and 12 h at 70 °F, base 65 → HDD = CDD = 2.5", () => {
    const profile = temperatureProfileFromHourly([...Array(12).fill(60), ...Array(12).fill(70)]);
    expect(hddPerDay(profile, 65)).toBeCloseTo(2.5, 12);
    expect(cddPerDay(profile, 65)).toBeCloseTo(2.5, 12);
  });

  it("property: prefix sums equal direct integration (degreeDaysFromHourly) for any temps and base", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -40, max: 45, noNaN: true }), { minLength: 24, maxLength: 24 * 40 }).filter((a) => a.length % 24 === 0),
        fc.double({ min: -30, max: 40, noNaN: true }),
        (temps, base) => {
          const profile = temperatureProfileFromHourly(temps);
          const direct = degreeDaysFromHourly(temps, base);
          const days = temps.length / 24;
          // Per day × days = total degree-days; tolerance covers the τ·W − S cancellation (|T| ≤ 45, ≤ 960 h).
          expect(hddPerDay(profile, base) * days).toBeCloseTo(direct.heating, 7);
          expect(cddPerDay(profile, base) * days).toBeCloseTo(direct.cooling, 7);
        },
      ),
      { numRuns: 200 },
    );
  });

  it("property: a period's profile equals degreeDaysForPeriod (edge overlaps, NaN hours, hours beyond the series)", () => {
    const HOUR = 3_600_000;
    fc.assert(
      fc.property(
        fc.array(fc.oneof(fc.double({ min: -30, max: 40, noNaN: true }), fc.constant(Number.NaN)), { minLength: 10, maxLength: 300 }),
        fc.double({ min: -5, max: 250, noNaN: true }),
        fc.double({ min: 1, max: 200, noNaN: true }),
        fc.double({ min: -20, max: 35, noNaN: true }),
        (temps, startH, lengthH, base) => {
          const series = { startMs: 1_700_000_000_000, temps };
          const startMs = series.startMs + Math.round(startH * HOUR);
          const endMs = startMs + Math.round(lengthH * HOUR);
          const direct = degreeDaysForPeriod(series, startMs, endMs, base);
          const profile = temperatureProfileForPeriod(series, startMs, endMs);
          expect(profile.hoursCovered).toBeCloseTo(direct.hoursCovered, 9);
          expect(profile.hoursTotal).toBeCloseTo(direct.hoursCovered + direct.hoursMissing, 9);
          if (direct.hoursCovered > 1e-9) {
            // heatingScaled is the period's total scaled up for missing hours; per day = × 24 / total hours.
            const days = profile.hoursTotal / 24;
            expect(hddPerDay(profile, base)).toBeCloseTo(direct.heatingScaled / days, 7);
            expect(cddPerDay(profile, base)).toBeCloseTo(direct.coolingScaled / days, 7);
          }
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe("daily-mean profile (blockHours = 24)", () => {
  const HOUR = 3_600_000;
  it("hand-computed (project references): 12 h at 60 °F + 12 h at 70 °F, base 65 → daily mean 65, HDD = CDD = 0 (mean method)", () => {
    const series = { startMs: 0, temps: [...Array(12).fill(60), ...Array(12).fill(70)] };
    const profile = temperatureProfileForPeriod(series, 0, 24 * HOUR, { blockHours: 24 });
    expect(hddPerDay(profile, 65)).toBe(0);
    expect(cddPerDay(profile, 65)).toBe(0);
    expect(hddPerDay(profile, 66)).toBeCloseTo(1, 12);
  });

  it("property: equals the mean over whole days of (base − daily mean)⁺ computed directly", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 40 }),
        fc.array(fc.double({ min: -30, max: 40, noNaN: true }), { minLength: 24 * 40, maxLength: 24 * 40 }),
        fc.double({ min: -20, max: 35, noNaN: true }),
        (days, temps, base) => {
          const series = { startMs: 0, temps };
          const profile = temperatureProfileForPeriod(series, 0, days * 24 * HOUR, { blockHours: 24 });
          let hdd = 0;
          for (let d = 0; d < days; d++) {
            const dayMean = temps.slice(24 * d, 24 * d + 24).reduce((s, t) => s + t, 0) / 24;
            hdd += Math.max(0, base - dayMean);
          }
          expect(hddPerDay(profile, base)).toBeCloseTo(hdd / days, 7);
          expect(profile.hoursCovered).toBeCloseTo(days * 24, 9);
        },
      ),
      { numRuns: 100 },
    );
  });

  it("refuses a block that is not a positive whole number of hours", () => {
    expect(() => temperatureProfileForPeriod({ startMs: 0, temps: [1, 2] }, 0, 2 * HOUR, { blockHours: 1.5 })).toThrow(ModelInputError);
  });
});

describe("degree-day regression at fixed bases against statsmodels WLS (scripts/reference/make_degree_day_fixtures.py)", () => {
  expect(fixture.cases.map((c) => c.form)).toEqual(["HO", "CO", "HC"]);
  for (const c of fixture.cases) {
    it(`${c.name}: regressors, coefficients, SEs, t, fitted, SSE and R² to 1e-8 relative`, () => {
      const fit = fitDegreeDayFormAt(periodsOf(c), c.form, c.fixedBases);
      const periods = periodsOf(c);
      periods.forEach((p, i) => fit.regressors(p.profile).forEach((v, j) => expect(rel(v, c.expected.regressors[i][j]), `x${i},${j}`).toBeLessThan(1e-10)));
      c.expected.coefficients.forEach((v, j) => expect(rel(fit.ols.coefficients[j], v), `beta${j}`).toBeLessThan(1e-8));
      c.expected.standardErrors.forEach((v, j) => expect(rel(fit.ols.standardErrors[j], v), `se${j}`).toBeLessThan(1e-8));
      c.expected.tValues.forEach((v, j) => expect(rel(fit.ols.tValues[j], v), `t${j}`).toBeLessThan(1e-8));
      c.expected.fitted.forEach((v, i) => expect(rel(fit.ols.fitted[i], v), `fitted${i}`).toBeLessThan(1e-8));
      expect(rel(fit.ols.sse, c.expected.sse)).toBeLessThan(1e-8);
      expect(rel(fit.ols.rSquared, c.expected.rSquared)).toBeLessThan(1e-8);
      expect(fit.intercept).toBe(fit.ols.coefficients[0]);
      expect(fit.slopes.map((s) => s.value)).toEqual(fit.ols.coefficients.slice(1));
    });

    it(`${c.name}: 99 % observation interval equals statsmodels' (bases fixed, df n − k); the model's uses n − p`, () => {
      const fit = fitDegreeDayFormAt(periodsOf(c), c.form, c.fixedBases);
      const n = c.periods.length;
      const k = c.expected.coefficients.length;
      const p = fit.parameterCount;
      for (const pr of c.predictions) {
        const profile = temperatureProfileFromHourly(pr.temps);
        const sm = fit.ols.predictWithInterval(fit.regressors(profile), pr.level, pr.days);
        expect(rel(sm.fit, pr.fit)).toBeLessThan(1e-8);
        expect(rel(sm.seMean, pr.seMean)).toBeLessThan(1e-8);
        expect(rel(sm.lower, pr.lower)).toBeLessThan(1e-8);
        expect(rel(sm.upper, pr.upper)).toBeLessThan(1e-8);
        // Derived from the statsmodels values: RMSE uses n − p (bases counted), so the standard
        // error scales by sqrt((n − k)/(n − p)) and the t quantile moves to n − p degrees of freedom.
        const model = fit.predictWithInterval(profile, pr.level, pr.days);
        const smHalf = (pr.upper - pr.lower) / 2;
        const tK = studentTQuantile(0.995, n - k);
        const tP = studentTQuantile(0.995, n - p);
        const wantHalf = (smHalf / tK) * Math.sqrt((n - k) / (n - p)) * tP;
        expect(rel((model.upper - model.lower) / 2, wantHalf)).toBeLessThan(1e-8);
        expect(rel(model.fit, pr.fit)).toBeLessThan(1e-8);
      }
    });

    if (c.searched) {
      const s = c.searched;
      it(`${c.name}: searched base matches a dense scan + scipy bounded minimisation (SSE within 0.1 %, base within 0.3 °C)`, () => {
        const fit = fitDegreeDayForm(periodsOf(c), c.form, { baseRange: { min: s.range[0], max: s.range[1], step: 0.5, refineStep: 0.05 } });
        const base = c.form === "HO" ? fit.heatingBase : fit.coolingBase;
        // The coarse-then-fine grid stops on a 0.05 °C lattice; the reference optimum is continuous.
        expect(fit.ols.sse).toBeGreaterThanOrEqual(s.sse * (1 - 1e-9));
        expect(fit.ols.sse).toBeLessThanOrEqual(s.sse * 1.001);
        expect(Math.abs((base as number) - s.base)).toBeLessThanOrEqual(0.3);
        expect(fit.parameterCount).toBe(3);
        expect(fit.stats.p).toBe(3);
      });
    }
  }
});

/** Three years of monthly periods of invented hourly temperatures (°C): seasonal + daily swing + weather noise. */
function constructedPeriods(seed: number, use: (hddAt: (b: number) => number, cddAt: (b: number) => number) => number, noiseSd: number): DegreeDayPeriod[] {
  let state = seed >>> 0;
  const uniform = (): number => {
    state = (state * 1664525 + 1013904223) >>> 0;
    return (state + 0.5) / 4294967296;
  };
  const normal = (): number => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
  const periods: DegreeDayPeriod[] = [];
  let anomaly = 0;
  for (let m = 0; m < 36; m++) {
    const days = 28 + Math.floor(uniform() * 6);
    const temps: number[] = [];
    for (let h = 0; h < days * 24; h++) {
      if (h % 24 === 0) anomaly = 0.7 * anomaly + 2.5 * normal();
      const seasonal = 11 + 13 * Math.sin((2 * Math.PI * (m + h / (24 * 30) - 3.5)) / 12);
      temps.push(seasonal + anomaly + 5 * Math.sin((2 * Math.PI * ((h % 24) - 9)) / 24));
    }
    const profile = temperatureProfileFromHourly(temps);
    const truth = use((b) => hddPerDay(profile, b), (b) => cddPerDay(profile, b));
    periods.push({ profile, days, usePerDay: truth * (1 + noiseSd * normal()) });
  }
  return periods;
}

describe("base recovery on constructed data (hourly temperatures, known base and slope)", () => {
  it("heating only, τH = 15 °C, 8 units per degree-day, 1 % noise: τH within 0.5 °C, slope within 5 %, HO chosen", () => {
    const periods = constructedPeriods(7, (hdd) => 40 + 8 * hdd(15), 0.01);
    const sel = fitDegreeDayModel(periods);
    expect(sel.chosen?.form).toBe("HO");
    expect(Math.abs((sel.chosen!.heatingBase as number) - 15)).toBeLessThanOrEqual(0.5);
    expect(rel(sel.chosen!.slopes[0].value, 8)).toBeLessThan(0.05);
    expect(sel.chosen!.stats.cvRmsePct).toBeLessThan(3);
  });

  it("a base on the edge of the search range is noted, not rejected", () => {
    const periods = constructedPeriods(7, (hdd) => 40 + 8 * hdd(15), 0.01);
    const sel = fitDegreeDayModel(periods, { forms: ["HO"], baseRange: { min: 16, max: 25, step: 0.5, refineStep: 0.05 } });
    expect(sel.chosen?.heatingBase).toBe(16);
    expect(sel.tried[0].notes).toEqual(["heating base 16 is on the edge of the search range 16…25"]);
    expect(fitDegreeDayModel(periods, { forms: ["HO"] }).tried[0].notes).toEqual([]);
  });

  it("no noise: the search finds τH = 15 exactly on its 0.05 °C lattice and a zero-error fit", () => {
    const periods = constructedPeriods(11, (hdd) => 40 + 8 * hdd(15), 0);
    const fit = fitDegreeDayForm(periods, "HO");
    expect(fit.heatingBase).toBeCloseTo(15, 9);
    expect(fit.rmse).toBeLessThan(1e-9);
  });

  it("heating and cooling, τH = 13 °C, τC = 20 °C: both within 0.5 °C, HC chosen", () => {
    const periods = constructedPeriods(23, (hdd, cdd) => 200 + 10 * hdd(13) + 25 * cdd(20), 0.005);
    const sel = fitDegreeDayModel(periods);
    expect(sel.chosen?.form).toBe("HC");
    expect(Math.abs((sel.chosen!.heatingBase as number) - 13)).toBeLessThanOrEqual(0.5);
    expect(Math.abs((sel.chosen!.coolingBase as number) - 20)).toBeLessThanOrEqual(0.5);
    expect(sel.chosen!.parameterCount).toBe(5);
  });

  it("in °F with the °F default range: τH = 59 °F (15 °C) within 0.9 °F", () => {
    const toF = (p: DegreeDayPeriod): DegreeDayPeriod => ({
      ...p,
      profile: temperatureProfileFromHourly(Array.from(p.profile.sortedTemps, (t) => t * 1.8 + 32)),
    });
    const periods = constructedPeriods(7, (hdd) => 40 + 8 * hdd(15), 0.01).map(toF);
    const fit = fitDegreeDayForm(periods, "HO", { tempUnit: "F" });
    expect(Math.abs((fit.heatingBase as number) - 59)).toBeLessThanOrEqual(0.9);
  });

  it("weather-independent use: the constant form wins in at least 80 of 100 seeded series (base search makes |t| optimistic)", () => {
    // Searching the base is a multiple comparison: the fixed-base t value overstates the evidence,
    // so a weather-free series sometimes passes |t| ≥ 2 at some base. Measured: 90 of 100 seeds
    // choose the constant form; 80 leaves room for implementation changes but fails if the
    // selection stops charging for the base (p) or drops the |t| rule.
    let constant = 0;
    for (let seed = 1; seed <= 100; seed++) {
      const sel = fitDegreeDayModel(constructedPeriods(seed, () => 100, 0.02));
      if (sel.chosen?.form === "constant") constant++;
      expect(sel.tried.map((t) => t.form)).toEqual(["constant", "HO", "CO", "HC"]);
    }
    expect(constant).toBeGreaterThanOrEqual(80);
  });

  it("use that falls with cold weather: heating slope cannot be positive, HO is rejected", () => {
    const periods = constructedPeriods(3, (hdd) => 400 - 8 * hdd(15), 0.005);
    const sel = fitDegreeDayModel(periods);
    const ho = sel.tried.find((t) => t.form === "HO")!;
    expect(ho.accepted).toBe(false);
    expect(ho.fit).toBeUndefined();
    expect(ho.reasons.join(" ")).toMatch(/positive heating slope/);
  });
});

describe("degree-day regression input errors", () => {
  const periods = constructedPeriods(7, (hdd) => 40 + 8 * hdd(15), 0.01);
  it("HC with τH above τC is refused", () => {
    expect(() => fitDegreeDayFormAt(periods, "HC", { heatingBase: 18, coolingBase: 15 })).toThrow(ModelInputError);
  });
  it("a missing base, non-positive days, or a period without temperatures is refused", () => {
    expect(() => fitDegreeDayFormAt(periods, "HO", {})).toThrow(/heating base/);
    expect(() => fitDegreeDayForm([{ ...periods[0], days: 0 }, ...periods.slice(1)], "HO")).toThrow(/billing days/);
    const empty = temperatureProfileFromHourly([Number.NaN, Number.NaN]);
    expect(() => fitDegreeDayForm([{ ...periods[0], profile: empty }, ...periods.slice(1)], "HO")).toThrow(/no hour/);
  });
  it("too few periods for the form", () => {
    expect(() => fitDegreeDayForm(periods.slice(0, 5), "HC")).toThrow(/more than 5 periods/);
    expect(fitDegreeDayModel(periods.slice(0, 5)).tried.find((t) => t.form === "HC")?.accepted).toBe(false);
  });
});
