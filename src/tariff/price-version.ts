/**
 * Prices one bill in full under one tariff version: every charge becomes one line, amounts
 * rounded half-up to the cent per line. Proration across versions happens in price.ts.
 */
import type { ComputedLine, LinePart } from "./types.ts";
import type { Charge, TariffVersion } from "./model.ts";
import type { BillContext } from "./context.ts";
import { MINIMUM_BILL_LABEL } from "./model.ts";
import { groupedNumber } from "./format.ts";
import { line, NO_POWER_FACTOR_NOTE, rateOf, worstStatus } from "./lines.ts";
import { priceDemand } from "./price-demand.ts";
import { VersionState } from "./version-state.ts";
import { roundCents, sumAmounts } from "../core/money.ts";

export { worstStatus } from "./lines.ts";

export interface VersionResult {
  lines: ComputedLine[];
  billingDemandKw: number | null;
  notes: string[];
}

const fmt = groupedNumber;

function priceBlocks(st: VersionState, charge: Extract<Charge, { kind: "blocks" }>): ComputedLine {
  const { ctx } = st;
  const unit = ctx.tariff.usageUnit;
  const scale = charge.scaleByDays ? ctx.days / 30 : 1;
  const parts: LinePart[] = [];
  let lower = 0;
  let remaining = ctx.usage;
  charge.blocks.forEach((b, i) => {
    const upper = b.upTo === null ? Infinity : b.upTo * scale;
    const size = upper - lower;
    const q = i === 0 && remaining < 0 ? remaining : Math.max(0, Math.min(remaining, size));
    if (q !== 0 || i === 0) {
      const label = !ctx.detail ? "" : b.upTo === null ? `over ${fmt(lower)} ${unit}` : `${fmt(lower)}–${fmt(upper)} ${unit}`;
      parts.push({ label, quantity: q, unit, rate: b.rate, amount: q * b.rate });
    }
    remaining -= q;
    lower = upper;
  });
  const amount = sumAmounts(parts.map((p) => p.amount));
  const single = parts.length === 1;
  const note = !ctx.detail
    ? null
    : [parts.map((p) => `${fmt(p.quantity)} × ${fmt(p.rate, 6)}`).join(" + "), charge.scaleByDays ? `block sizes × ${ctx.days}/30 days` : null]
        .filter(Boolean)
        .join("; ");
  return line(charge, ctx.usage, unit, single ? parts[0].rate : null, amount, note, "exact", parts);
}

function priceEnergy(st: VersionState, charge: Extract<Charge, { kind: "energy" }>): ComputedLine {
  const { ctx, version } = st;
  const unit = ctx.tariff.usageUnit;
  if ("flat" in charge.rate) {
    return line(charge, ctx.usage, unit, charge.rate.flat, ctx.usage * charge.rate.flat, null, "exact");
  }
  const split = st.periodSplit();
  const parts: LinePart[] = version.periods.map((p, i) => {
    const r = rateOf(charge.rate, p.name) ?? 0;
    return { label: p.name, quantity: split.usage[i], unit, rate: r, amount: split.usage[i] * r };
  });
  const amount = sumAmounts(parts.map((p) => p.amount));
  const note = ctx.detail ? `${parts.map((p) => `${p.label} ${fmt(p.quantity)} × ${fmt(p.rate, 6)}`).join(" + ")}; ${split.note}` : null;
  return line(charge, split.total, unit, null, amount, note, split.status, parts);
}

/**
 * Prices every charge of `version` for the bill in `ctx`.
 * Order of work: all non-percent charges, then the minimum bill, then percent lines (each over
 * the rounded lines above it); the minimum-bill line is placed just before the first percent line.
 */
export function priceVersion(ctx: BillContext, version: TariffVersion): VersionResult {
  const st = new VersionState(ctx, version);
  const prev = ctx.req.previousBillingDemandsKw ?? [];
  const slots: (ComputedLine | null)[] = version.charges.map(() => null);
  let billingKw: number | null = null;
  const notes: string[] = [];

  version.charges.forEach((charge, i) => {
    switch (charge.kind) {
      case "fixed":
        slots[i] = line(charge, 1, "bill", charge.amount, charge.amount, null, "exact");
        break;
      case "blocks":
        slots[i] = priceBlocks(st, charge);
        break;
      case "energy":
        slots[i] = priceEnergy(st, charge);
        break;
      case "demand": {
        const r = priceDemand(st, charge, prev);
        slots[i] = r.line;
        if (billingKw === null && r.billingKw !== null) billingKw = r.billingKw;
        break;
      }
      case "power-factor": {
        const demandLines = slots.slice(0, i).filter((l): l is ComputedLine => l !== null && l.kind === "demand");
        const base = sumAmounts(demandLines.map((l) => l.amount));
        const status = worstStatus(demandLines.map((l) => l.status));
        const pf = ctx.req.powerFactor;
        if (pf == null) {
          slots[i] = line(charge, base, ctx.tariff.currency, 0, 0, NO_POWER_FACTOR_NOTE, status);
        } else if (pf >= charge.targetPf) {
          slots[i] = line(charge, base, ctx.tariff.currency, 0, 0, ctx.detail ? `power factor ${fmt(pf)} meets the target ${fmt(charge.targetPf)}` : null, status);
        } else {
          const factor = charge.targetPf / pf - 1;
          slots[i] = line(
            charge,
            base,
            ctx.tariff.currency,
            factor,
            base * factor,
            ctx.detail ? `power factor ${fmt(pf)} below ${fmt(charge.targetPf)}: demand charges ${fmt(base, 2)} × (${fmt(charge.targetPf)}/${fmt(pf)} − 1)` : null,
            status,
          );
        }
        break;
      }
      case "percent":
        break; // after the minimum bill
    }
  });

  const ordered: ComputedLine[] = [];
  let minLine: ComputedLine | null = null;
  if (version.minimumBill !== null) {
    const before = slots.filter((l): l is ComputedLine => l !== null);
    const subtotal = roundCents(sumAmounts(before.map((l) => l.amount)));
    if (subtotal < version.minimumBill) {
      minLine = {
        label: MINIMUM_BILL_LABEL,
        kind: "minimum-bill",
        quantity: 1,
        unit: "bill",
        rate: roundCents(version.minimumBill - subtotal),
        amount: roundCents(version.minimumBill - subtotal),
        note: ctx.detail ? `charges ${subtotal.toFixed(2)} are below the minimum bill ${version.minimumBill.toFixed(2)}` : null,
        status: worstStatus(before.map((l) => l.status)),
      };
    }
  }
  version.charges.forEach((charge, i) => {
    if (charge.kind !== "percent") {
      ordered.push(slots[i] as ComputedLine);
      return;
    }
    if (minLine !== null) {
      ordered.push(minLine);
      minLine = null;
    }
    const base = charge.of === "all" ? ordered : ordered.filter((l) => (charge.of as string[]).includes(l.label));
    const baseAmount = roundCents(sumAmounts(base.map((l) => l.amount)));
    const rate = charge.percent / 100;
    const what = charge.of === "all" ? "all lines above" : charge.of.join(", ");
    const note = ctx.detail ? `${fmt(charge.percent)}% of ${baseAmount.toFixed(2)} (${what})` : null;
    ordered.push(line(charge, baseAmount, ctx.tariff.currency, rate, baseAmount * rate, note, worstStatus(base.map((l) => l.status))));
  });
  if (minLine !== null) ordered.push(minLine);
  return { lines: ordered, billingDemandKw: billingKw, notes };
}

