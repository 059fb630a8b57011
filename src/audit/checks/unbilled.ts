/**
 * What a period nobody billed is worth: its expected usage priced through the meter's tariff as
 * if it were a bill (shared by period-gap and missing-bill). The utility may still bill it, so
 * the amount is a back-billing risk, negative in the finding's sign convention (billed too low).
 */
import type { Bill } from "../../domain/types.ts";
import type { AuditContext } from "../context.ts";
import { formatQty } from "../format.ts";
import type { CorrectedBill } from "../types.ts";
import { daysBetween } from "../../core/time/index.ts";
import { roundCents } from "../../core/money.ts";

/** Expected usage of a stretch in the bill unit, with its band and where it comes from. */
export interface ExpectedStretchUsage {
  p50: number;
  low: number;
  high: number;
  /** Plain words, e.g. "the meter's weather model (degree-days of the period)". */
  basis: string;
  /** Demand to price with (kW); null = the meter's own peak, or none. */
  demandKw: number | null;
}

/**
 * Expected usage of [from, to): the meter's weather model when the caller provides one, else the
 * neighbouring bills' use per day × days (band: the lower and higher of the two).
 */
export function expectedStretchUsage(ctx: AuditContext, meterId: string, from: string, to: string, neighbours: Bill[]): ExpectedStretchUsage | null {
  const demands = neighbours.map((b) => b.demandKw).filter((d): d is number => d !== null);
  const demandKw = demands.length ? demands.reduce((s, d) => s + d, 0) / demands.length : null;
  const model = ctx.input.expectedUsageForPeriod?.(meterId, from, to) ?? null;
  if (model && Number.isFinite(model.p50) && model.p50 >= 0) return { ...model, low: Math.max(0, model.low), demandKw };
  const days = daysBetween(from, to);
  const perDay = neighbours.map((b) => b.usage / daysBetween(b.periodStart, b.periodEnd)).filter((x) => Number.isFinite(x) && x >= 0);
  if (perDay.length === 0 || days <= 0) return null;
  const mean = perDay.reduce((s, x) => s + x, 0) / perDay.length;
  return {
    p50: mean * days,
    low: Math.min(...perDay) * days,
    high: Math.max(...perDay) * days,
    basis: `the neighbouring bills' use per day (${perDay.map((x) => formatQty(x)).join(" and ")}) × ${days} days`,
    demandKw,
  };
}

/**
 * The stretch priced as a bill (template: a neighbouring bill of the same meter, for its power
 * factor and ratchet history), with low and high prices from the usage band. Null without a
 * reprice hook or when the tariff cannot price it.
 */
export function unbilledCorrection(ctx: AuditContext, template: Bill, from: string, to: string, usage: ExpectedStretchUsage, unit: string): CorrectedBill | null {
  const reprice = ctx.input.reprice;
  if (!reprice) return null;
  const asBill: Bill = { ...template, periodStart: from, periodEnd: to, usage: usage.p50, demandKw: usage.demandKw, readType: "estimated", total: 0 };
  const price = (u: number) => reprice({ ...asBill, usage: u }, { kind: "quantities", usage: u, demandKw: usage.demandKw });
  const mid = price(usage.p50);
  if (mid === null) return null;
  const low = price(usage.low);
  const high = price(usage.high);
  const out: CorrectedBill = {
    billId: null,
    periodStart: from,
    periodEnd: to,
    billedTotal: 0,
    correctedTotal: roundCents(mid.total),
    corrected: mid,
    usage: usage.p50,
    demandKw: usage.demandKw ?? mid.billingDemandKw,
    correctedOn: `${usage.low === usage.high ? `${formatQty(usage.p50)} ${unit} from ${usage.basis}` : `an expected ${formatQty(usage.p50)} ${unit} (${formatQty(usage.low)} to ${formatQty(usage.high)}) from ${usage.basis}`}${usage.demandKw !== null ? `, demand ${formatQty(usage.demandKw)} kW (the neighbouring bills' average)` : ""}, priced through the tariff`,
  };
  if (low !== null && high !== null) out.range = { low: roundCents(Math.min(low.total, high.total)), high: roundCents(Math.max(low.total, high.total)) };
  return out;
}
