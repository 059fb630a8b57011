/**
 * priceBill: one bill, one tariff, every line with quantity, rate and amount.
 *
 * A bill spanning several tariff versions is priced in full under each version and each line
 * weighted by the version's share of billing days (the usual utility proration). Each line is
 * rounded half-up to the cent; the total is the sum of the rounded lines.
 */
import type { ComputedBill, ComputedLine, LinePart, PriceRequest } from "./types.ts";
import type { Tariff, TariffVersion } from "./model.ts";
import { billContext, type BillContext } from "./context.ts";
import { PricingError } from "./errors.ts";
import { priceVersion, worstStatus, type VersionResult } from "./price-version.ts";
import { daysBetween } from "../core/time/index.ts";
import { roundCents, sumAmounts } from "../core/money.ts";

/** Versions in force during [start, end) with their number of days. */
export function versionsInForce(tariff: Tariff, start: string, end: string): { version: TariffVersion; days: number }[] {
  const first = tariff.versions[0];
  if (!first || start < first.from) {
    throw new PricingError(
      `no version of tariff '${tariff.id}' is in force on ${start}${first ? ` (the first version starts ${first.from})` : ""}`,
    );
  }
  const out: { version: TariffVersion; days: number }[] = [];
  for (const v of tariff.versions) {
    const from = v.from > start ? v.from : start;
    const until = v.until !== null && v.until < end ? v.until : end;
    const days = daysBetween(from, until);
    if (days > 0) out.push({ version: v, days });
  }
  return out;
}

function fmtRate(n: number): string {
  return String(Number(n.toFixed(6)));
}

/** Weighted sum of one label's lines across versions (missing in a version = 0 there). */
function mergeLine(label: string, results: VersionResult[], weights: number[], versions: TariffVersion[], dayCounts: number[], detail: boolean): ComputedLine {
  const present = results.map((r) => r.lines.find((l) => l.label === label) ?? null);
  const first = present.find((l) => l !== null) as ComputedLine;
  // Without detail every note is null, so lines equal in amount, quantity and rate count as the
  // same; with detail a different note prorates the equal amounts, which gives the same cents.
  const same = present.every(
    (l) => l !== null && l.amount === first.amount && l.quantity === first.quantity && l.rate === first.rate && l.note === first.note,
  );
  if (same) return first;
  const sameNote = present.every((l) => l === null || l.note === first.note);
  let amount = 0;
  let quantity: number | null = 0;
  let rate: number | null = 0;
  const parts: LinePart[] = [];
  const pieces: string[] = [];
  present.forEach((l, i) => {
    if (l === null) {
      if (detail) pieces.push(`${dayCounts[i]} days under the version from ${versions[i].from}: no such charge`);
      return;
    }
    amount += l.amount * weights[i];
    quantity = quantity === null || l.quantity === null ? null : quantity + l.quantity * weights[i];
    rate = rate === null || l.rate === null ? null : rate + l.rate * weights[i];
    if (detail) pieces.push(`${dayCounts[i]} days at ${l.rate === null ? "the rates" : fmtRate(l.rate)} (version from ${versions[i].from}: ${l.amount.toFixed(2)})`);
    for (const p of l.parts ?? []) parts.push({ ...p, label: detail ? `${versions[i].from}: ${p.label}` : "", amount: p.amount * weights[i] });
  });
  const allSameQuantity = present.every((l) => l === null || l.quantity === first.quantity);
  const out: ComputedLine = {
    label,
    kind: first.kind,
    quantity: allSameQuantity ? first.quantity : quantity,
    unit: first.unit,
    rate,
    amount: roundCents(amount),
    note: detail ? `prorated by days: ${pieces.join("; ")}${sameNote && first.note ? `; ${first.note}` : ""}` : null,
    status: worstStatus(present.filter((l): l is ComputedLine => l !== null).map((l) => l.status)),
  };
  if (parts.length > 0) out.parts = parts;
  return out;
}

/**
 * Prices one bill under a tariff.
 *
 * @throws PricingError when the request cannot be priced: no version in force for the whole
 *   period, a usage unit that does not convert to the tariff's, an unknown time zone, a demand
 *   window that does not fit the interval length. A valid tariff file alone never throws.
 * @example priceBill(tariff, { periodStart: "2025-01-01", periodEnd: "2025-02-01", timezone: "UTC", usage: 1200, usageUnit: "kWh" }).total
 */
export function priceBill(tariff: Tariff, req: PriceRequest): ComputedBill {
  const ctx = billContext(tariff, req);
  return priceInContext(ctx, versionsInForce(tariff, req.periodStart, req.periodEnd));
}

/**
 * Prices a prepared bill context under the versions in force (priceBill, and pricing plans that
 * prepare the context and the versions once). Without `ctx.detail` lines carry no notes and
 * the bill no notes; amounts, totals, billing demand and statuses are the same.
 */
export function priceInContext(ctx: BillContext, inForce: { version: TariffVersion; days: number }[]): ComputedBill {
  const { tariff, req } = ctx;
  const results = inForce.map(({ version }) => priceVersion(ctx, version));
  const weights = inForce.map(({ days }) => days / ctx.days);
  const notes: string[] = [];

  let lines: ComputedLine[];
  if (results.length === 1) {
    lines = results[0].lines;
  } else {
    const labels: string[] = [];
    for (const r of results) for (const l of r.lines) if (!labels.includes(l.label)) labels.push(l.label);
    lines = labels.map((label) =>
      mergeLine(label, results, weights, inForce.map((x) => x.version), inForce.map((x) => x.days), ctx.detail),
    );
    if (ctx.detail) notes.push(
      `Prorated: ${inForce.map((x) => `${x.days} of ${ctx.days} days under the version from ${x.version.from}`).join(", ")}; each version priced in full and weighted by its share of days.`,
    );
  }
  if (ctx.detail && ctx.usageFactor !== 1) {
    const heat =
      tariff.commodity === "gas" && ["ccf", "m3"].includes(ctx.requestUnit)
        ? ` (heat content ${tariff.heatContentThermPerCcf} therm/ccf${tariff.heatContentStated ? "" : ", the default"})`
        : "";
    notes.push(`Usage ${req.usage} ${ctx.requestUnit} converted to ${Number(ctx.usage.toFixed(6))} ${tariff.usageUnit}${heat}.`);
  }
  if (ctx.detail && req.intervals && req.intervals.startMs.length > 0 && ctx.intervals && ctx.intervals.startMs.length < ctx.intervals.expectedCount) {
    notes.push(`Interval data covers ${ctx.intervals.startMs.length} of ${ctx.intervals.expectedCount} intervals of the period.`);
  }
  if (ctx.detail) notes.push("Each line is rounded half-up to the cent; the total is the sum of the rounded lines.");
  const demands = results.map((r) => r.billingDemandKw).filter((d): d is number => d !== null);
  const billingDemand = demands.length === 0 ? null : sumAmounts(results.map((r, i) => (r.billingDemandKw ?? 0) * weights[i]));
  return {
    lines,
    total: roundCents(sumAmounts(lines.map((l) => l.amount))),
    billingDemandKw: billingDemand,
    versions: inForce.map((x, i) => ({ from: x.version.from, days: x.days, weight: weights[i] })),
    exact: lines.every((l) => l.status === "exact"),
    notes,
  };
}

