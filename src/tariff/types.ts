/**
 * Public contract of the tariff engine (src/tariff). Other stages (ingest, audit, forecast,
 * demo generator, CLI `price`) depend only on these names. Extend freely; do not break.
 *
 *   loadTariff(text, file)  -> { tariff: Tariff | null, issues: InputIssue[] }   (src/tariff/load.ts)
 *   priceBill(tariff, request) -> ComputedBill                                  (src/tariff/price.ts)
 *   pricingPlan(tariff, period).price(quantities) -> { total, billingDemandKw, exact }
 *     the same figures for many prices of one period, without notes             (src/tariff/plan.ts)
 */
import type { Commodity } from "../domain/types.ts";

/** Interval energy for the priced meter, multiplier already applied, in the meter's bill unit. */
export interface IntervalUsage {
  startMs: Float64Array;
  values: Float64Array;
  intervalMinutes: number;
}

export interface PriceRequest {
  /** First day of service, `YYYY-MM-DD`, local. */
  periodStart: string;
  /** First day NOT in the bill, `YYYY-MM-DD`, local. */
  periodEnd: string;
  /** IANA zone used for time-of-use periods and holidays. */
  timezone: string;
  /** Billed (or metered) usage in `usageUnit`. */
  usage: number;
  /** Unit of `usage` (kWh, MWh, therm, ccf, m3, gal); converted to the tariff's unit. */
  usageUnit: string;
  /** Measured maximum demand printed on the bill, kW. */
  demandKw?: number | null;
  powerFactor?: number | null;
  /** When present, time-of-use energy and demand are computed exactly from it. */
  intervals?: IntervalUsage | null;
  /**
   * What `intervals` stand for (default `quantities`):
   *  - `quantities`: the interval data ARE the bill's quantities — time-of-use usage and every
   *    demand come from them (flat and block lines still use `usage`);
   *  - `shape`: the bill's quantities are `usage` and `demandKw`; the interval data only split
   *    them over time-of-use periods (usage by the metered shares; period demand by the metered
   *    period peaks scaled to `demandKw`). The split is `exact` when the metered total agrees with
   *    `usage` (and the metered peak with `demandKw`) within the rounding of a printed figure
   *    (0.05 %), else `estimated`. Used to re-price a bill on one basis only (billed or corrected
   *    quantities), never mixing metered and billed figures in one recomputation.
   */
  intervalsGive?: "quantities" | "shape";
  /** Billing demand (kW) of previous bills, oldest first, for ratchets. */
  previousBillingDemandsKw?: number[];
  /** Share of usage by hour of week (168 values summing to 1) for estimating time-of-use splits. */
  loadShapeByHourOfWeek?: number[] | null;
}

/** How far a computed line can be trusted. */
export type LineStatus = "exact" | "estimated" | "needs-interval-data";

export interface ComputedLine {
  label: string;
  /** Charge kind: fixed, blocks, energy, demand, power-factor, percent, minimum-bill. */
  kind: string;
  quantity: number | null;
  unit: string;
  rate: number | null;
  /** Rounded half-up to the cent. */
  amount: number;
  note: string | null;
  status: LineStatus;
  /**
   * The pieces a line is made of when it has more than one rate (blocks, time-of-use periods,
   * per-period demand, versions of a prorated bill): each piece's quantity × rate = amount
   * (unrounded). Absent for single-rate lines.
   */
  parts?: LinePart[];
}

/** One piece of a multi-rate line, e.g. the peak part of a time-of-use energy charge. */
export interface LinePart {
  label: string;
  quantity: number;
  unit: string;
  rate: number;
  /** quantity × rate (× weight for a prorated bill), not rounded. */
  amount: number;
}

export interface ComputedBill {
  lines: ComputedLine[];
  /** Sum of rounded line amounts. */
  total: number;
  /** Billing demand after ratchet / minimum, when the tariff has demand charges. */
  billingDemandKw: number | null;
  /** Versions used and their weight by billing days. */
  versions: { from: string; days: number; weight: number }[];
  /** True when every line is `exact`. */
  exact: boolean;
  notes: string[];
}

export type { Commodity };
