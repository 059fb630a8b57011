/**
 * Reconciliation of one bill period against a meter's interval data: metered usage, peak
 * demand and how complete the data is. Pure: the caller passes the series and the zone.
 */
import type { Bill, IntervalSeries, Meter, Portfolio } from "../domain/types.ts";
import type { MeteredPeriod } from "./types.ts";
import { withFlaggedAsMissing } from "../clean/index.ts";
import { localMidnightMs } from "../core/time/index.ts";
import { lowerBound } from "../core/sorted.ts";
import { expectedProblem } from "../core/errors.ts";

export { localMidnightMs };

/**
 * Metered usage, peak demand and coverage of the half-open local period
 * [periodStart 00:00, periodEnd 00:00) in `timezone`.
 *
 * - An interval belongs to the period when its START instant lies in the period.
 * - expectedIntervals = (end instant − start instant) / interval length: the zone rules decide
 *   how long each local day is (a spring-forward day in America/New_York holds 92 fifteen-minute
 *   intervals, a fall-back day 100; 15 U.S.C. 260a).
 * - usage = Σ value × multiplier (Neumaier-compensated sum), in the meter's unit.
 * - peakKw = highest average over `windowMinutes` of contiguous intervals wholly inside the
 *   period: kW = energy × kwhPerUnit × 60 / windowMinutes (common practice: 25 kWh in 15 min
 *   → 100 kW). Null when `kwhPerUnit` is null (not electricity) or no full window exists.
 * - Non-finite values count as missing.
 *
 * @example meteredForPeriod(series, 1, "2024-03-10", "2024-03-11", "America/New_York").expectedIntervals // 92
 */
export function meteredForPeriod(
  series: IntervalSeries,
  multiplier: number,
  periodStart: string,
  periodEnd: string,
  timezone: string,
  windowMinutes = 15,
  kwhPerUnit: number | null = 1,
): MeteredPeriod {
  const startMs = localMidnightMs(periodStart, timezone);
  const endMs = localMidnightMs(periodEnd, timezone);
  const stepMs = series.intervalMinutes * 60_000;
  const expectedIntervals = Math.max(0, Math.round((endMs - startMs) / stepMs));
  const first = lowerBound(series.startMs, startMs);
  const last = lowerBound(series.startMs, endMs); // exclusive

  let sum = 0;
  let compensation = 0;
  let intervals = 0;
  for (let i = first; i < last; i++) {
    const v = series.values[i];
    if (!Number.isFinite(v)) continue;
    intervals++;
    const t = sum + v;
    compensation += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
    sum = t;
  }
  const usage = (sum + compensation) * multiplier;

  let peakKw: number | null = null;
  if (kwhPerUnit !== null) {
    const k = Math.max(1, Math.round(windowMinutes / series.intervalMinutes));
    const windowHours = (k * series.intervalMinutes) / 60;
    for (let i = first; i + k - 1 < last; i++) {
      // the window must be contiguous in time and complete
      if (series.startMs[i + k - 1] - series.startMs[i] !== (k - 1) * stepMs) continue;
      let energy = 0;
      let ok = true;
      for (let j = i; j < i + k; j++) {
        const v = series.values[j];
        if (!Number.isFinite(v)) { ok = false; break; }
        energy += v;
      }
      if (!ok) continue;
      const kw = (energy * multiplier * kwhPerUnit) / windowHours;
      if (peakKw === null || kw > peakKw) peakKw = kw;
    }
  }

  return {
    usage,
    peakKw,
    coverage: expectedIntervals === 0 ? 0 : Math.min(1, intervals / expectedIntervals),
    intervals,
    expectedIntervals,
    peakWindowMinutes: windowMinutes,
  };
}

/** kWh per unit for electricity bill units; null for other commodities (no demand). */
function kwhPerBillUnit(commodity: string, unit: string): number | null {
  if (commodity !== "electricity") return null;
  const u = unit.trim().toLowerCase();
  if (u === "mwh") return 1000;
  if (u === "kwh") return 1;
  return null;
}

/**
 * Builds `AuditInput.metered` for every bill of every meter that has interval data
 * (bills of meters without data are absent from the map; a bill whose zone or dates cannot
 * be resolved maps to null rather than throwing). `windowMinutesFor` lets the caller use each
 * meter's tariff demand window (default 15 minutes).
 *
 * With `masks` (per meter, from the data-quality stage; 1 = flagged), flagged readings count as
 * missing: usage, peak and coverage come from the unflagged readings only (the audit scales usage
 * up by coverage, so a flagged spike neither adds energy nor sets the peak), and the result
 * carries the raw view beside it (`raw`, `flaggedIntervals`) for the finding's evidence.
 * @example meteredForBills(portfolio).get("E1:2024-01-01")?.coverage
 */
export function meteredForBills(
  portfolio: Portfolio,
  windowMinutesFor: (meter: Meter) => number = () => 15,
  masks: ReadonlyMap<string, Uint8Array> = new Map(),
): Map<string, MeteredPeriod | null> {
  const out = new Map<string, MeteredPeriod | null>();
  const meters = new Map(portfolio.meters.map((m) => [m.meterId, m]));
  const zones = new Map(portfolio.buildings.map((b) => [b.buildingId, b.timezone]));
  const cleaned = new Map<string, IntervalSeries>();
  for (const bill of portfolio.bills as Bill[]) {
    const meter = meters.get(bill.meterId);
    const series = portfolio.intervals.get(bill.meterId);
    if (!meter || !series) continue;
    const zone = zones.get(meter.buildingId);
    if (!zone) continue;
    let clean = cleaned.get(bill.meterId);
    if (!clean) cleaned.set(bill.meterId, (clean = withFlaggedAsMissing(series, masks.get(bill.meterId))));
    try {
      const args = [meter.multiplier, bill.periodStart, bill.periodEnd, zone, windowMinutesFor(meter), kwhPerBillUnit(meter.commodity, meter.unit)] as const;
      const m = meteredForPeriod(clean, ...args);
      if (clean !== series) {
        const raw = meteredForPeriod(series, ...args);
        m.flaggedIntervals = raw.intervals - m.intervals;
        if (m.flaggedIntervals > 0) m.raw = { usage: raw.usage, peakKw: raw.peakKw, coverage: raw.coverage, intervals: raw.intervals };
      }
      out.set(bill.billId, m);
    } catch (error) {
      expectedProblem(error);
      out.set(bill.billId, null); // invalid zone/date: ingest reports it; the audit just cannot compare
    }
  }
  return out;
}
