/** Building computed lines: statuses, rates by period, rounding of each line to the cent. */
import type { ComputedLine, LinePart, LineStatus } from "./types.ts";
import type { Charge, RateSpec } from "./model.ts";
import { roundCents } from "../core/money.ts";

/** Statuses by trust, least trustworthy highest (what worstStatus compares). */
export const STATUS_RANK: Readonly<Record<LineStatus, number>> = { exact: 0, estimated: 1, "needs-interval-data": 2 };

/** The note of a power-factor line when the bill gives no power factor (kept even without detail). */
export const NO_POWER_FACTOR_NOTE = "no power factor given: no adjustment computed";

/** The least trustworthy of the statuses (needs-interval-data > estimated > exact). */
export function worstStatus(statuses: Iterable<LineStatus>): LineStatus {
  let worst: LineStatus = "exact";
  for (const s of statuses) if (STATUS_RANK[s] > STATUS_RANK[worst]) worst = s;
  return worst;
}


/** The rate of a period (or the flat rate). */
export function rateOf(rate: RateSpec, period: string): number | undefined {
  return "flat" in rate ? rate.flat : rate.byPeriod[period];
}

/** One computed line, its amount rounded half-up to the cent. */
export function line(
  charge: Charge,
  quantity: number | null,
  unit: string,
  rate: number | null,
  amount: number,
  note: string | null,
  status: LineStatus,
  parts?: LinePart[],
): ComputedLine {
  const l: ComputedLine = { label: charge.label, kind: charge.kind, quantity, unit, rate, amount: roundCents(amount), note, status };
  if (parts && parts.length > 0) l.parts = parts;
  return l;
}

