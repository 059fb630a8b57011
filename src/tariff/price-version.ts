/**
 * Prices one bill in full under one tariff version: every charge becomes one line, amounts
 * rounded half-up to the cent per line. Proration across versions happens in price.ts.
 */
import type { ComputedLine, LinePart, LineStatus } from "./types.ts";
import type { Charge, RateSpec, TariffVersion } from "./model.ts";
import type { BillContext } from "./context.ts";
import { hourOfWeek, periodIndices } from "./calendar.ts";
import { billingDemandKw, maxWindowDemandByPeriodKw, maxWindowDemandKw } from "./demand.ts";
import { MINIMUM_BILL_LABEL } from "./model.ts";
import { roundCents, sumAmounts } from "./rounding.ts";
import { groupedNumber } from "./format.ts";

export interface VersionResult {
  lines: ComputedLine[];
  billingDemandKw: number | null;
  notes: string[];
}

const STATUS_RANK: Record<LineStatus, number> = { exact: 0, estimated: 1, "needs-interval-data": 2 };

/** The least trustworthy of the statuses (needs-interval-data > estimated > exact). */
export function worstStatus(statuses: Iterable<LineStatus>): LineStatus {
  let worst: LineStatus = "exact";
  for (const s of statuses) if (STATUS_RANK[s] > STATUS_RANK[worst]) worst = s;
  return worst;
}

const fmt = groupedNumber;

/** Shares of usage by period, with how they were obtained. */
interface PeriodSplit {
  /** Usage per period index, in the tariff unit. */
  usage: number[];
  total: number;
  status: LineStatus;
  note: string | null;
}

/** Per-version cache of work shared by several charges. */
class VersionState {
  private periodIdx: Int8Array | null = null;
  private hourlyIdx: Int8Array | null = null;
  private split: PeriodSplit | null = null;
  constructor(
    readonly ctx: BillContext,
    readonly version: TariffVersion,
  ) {}

  intervalPeriods(): Int8Array {
    if (this.periodIdx === null) this.periodIdx = periodIndices(this.ctx.intervals!.local, this.version);
    return this.periodIdx;
  }

  hourlyPeriods(): Int8Array {
    if (this.hourlyIdx === null) this.hourlyIdx = periodIndices(this.ctx.hourly().local, this.version);
    return this.hourlyIdx;
  }

  /** Weight of each hour of the period: the load shape when known, else 1 (split by hours). */
  hourWeights(): Float64Array {
    const h = this.ctx.hourly();
    const shape = this.ctx.req.loadShapeByHourOfWeek;
    const w = new Float64Array(h.startMs.length);
    if (shape && shape.length === 168) {
      const how = hourOfWeek(h.local);
      for (let i = 0; i < w.length; i++) w[i] = Math.max(0, shape[how[i]] ?? 0);
    } else {
      w.fill(1);
    }
    return w;
  }

  hasShape(): boolean {
    const s = this.ctx.req.loadShapeByHourOfWeek;
    return !!s && s.length === 168 && s.some((v) => v > 0);
  }

  periodSplit(): PeriodSplit {
    if (this.split) return this.split;
    const n = this.version.periods.length;
    const usage = new Array<number>(n).fill(0);
    const iv = this.ctx.intervals;
    const unit = this.ctx.tariff.usageUnit;
    if (iv && iv.startMs.length > 0) {
      const idx = this.intervalPeriods();
      for (let i = 0; i < idx.length; i++) usage[idx[i]] += iv.usage[i];
      const metered = sumAmounts(usage);
      if (iv.startMs.length >= iv.expectedCount) {
        this.split = { usage, total: metered, status: "exact", note: `from ${iv.startMs.length} intervals of interval data` };
        return this.split;
      }
      if (metered > 0) {
        const scaled = usage.map((u) => (u / metered) * this.ctx.usage);
        this.split = {
          usage: scaled,
          total: this.ctx.usage,
          status: "estimated",
          note: `estimated: interval data covers ${iv.startMs.length} of ${iv.expectedCount} intervals, so billed ${fmt(this.ctx.usage)} ${unit} is split by the metered shares`,
        };
        return this.split;
      }
    }
    const w = this.hourWeights();
    const idx = this.hourlyPeriods();
    const byPeriod = new Array<number>(n).fill(0);
    for (let i = 0; i < idx.length; i++) byPeriod[idx[i]] += w[i];
    const sumW = sumAmounts(byPeriod);
    const shares = byPeriod.map((x) => (sumW > 0 ? x / sumW : 1 / n));
    const shaped = this.hasShape();
    this.split = {
      usage: shares.map((s) => s * this.ctx.usage),
      total: this.ctx.usage,
      status: shaped ? "estimated" : "needs-interval-data",
      note: shaped
        ? "estimated from the building's typical load shape (no interval data); needs interval data to be exact"
        : "needs interval data: usage split in proportion to the hours of each period (estimate)",
    };
    return this.split;
  }
}

function rateOf(rate: RateSpec, period: string): number | undefined {
  return "flat" in rate ? rate.flat : rate.byPeriod[period];
}

function line(
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
      const label = b.upTo === null ? `over ${fmt(lower)} ${unit}` : `${fmt(lower)}–${fmt(upper)} ${unit}`;
      parts.push({ label, quantity: q, unit, rate: b.rate, amount: q * b.rate });
    }
    remaining -= q;
    lower = upper;
  });
  const amount = sumAmounts(parts.map((p) => p.amount));
  const single = parts.length === 1;
  const note = [
    parts.map((p) => `${fmt(p.quantity)} × ${fmt(p.rate, 6)}`).join(" + "),
    charge.scaleByDays ? `block sizes × ${ctx.days}/30 days` : null,
  ]
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
  const detail = parts.map((p) => `${p.label} ${fmt(p.quantity)} × ${fmt(p.rate, 6)}`).join(" + ");
  return line(charge, split.total, unit, null, amount, `${detail}; ${split.note}`, split.status, parts);
}

function priceDemand(st: VersionState, charge: Extract<Charge, { kind: "demand" }>, prev: readonly number[]): { line: ComputedLine; billingKw: number | null } {
  const { ctx, version } = st;
  const iv = ctx.intervals;
  const req = ctx.req;
  const windowText = `${charge.windowMinutes}-minute`;
  if ("flat" in charge.rate) {
    let measured: number | null = null;
    let status: LineStatus = "exact";
    let source: string;
    if (iv && iv.kwh && iv.startMs.length > 0) {
      const d = maxWindowDemandKw(iv.startMs, iv.kwh, iv.intervalMinutes, charge.windowMinutes);
      measured = d.kw;
      source = `highest ${d.intervalsPerWindow * iv.intervalMinutes}-minute average from interval data`;
    } else {
      source = "";
    }
    if (measured === null && req.demandKw != null) {
      measured = req.demandKw;
      source = "billed maximum demand";
    }
    if (measured === null) {
      status = "needs-interval-data";
      source = "no demand on the bill and no interval data: measured demand taken as 0";
    }
    const b = billingDemandKw(measured ?? 0, prev, charge.ratchet, charge.minimumKw);
    const why =
      b.by === "ratchet"
        ? `ratchet: ${charge.ratchet!.percent}% of the highest of the last ${Math.min(prev.length, charge.ratchet!.months)} billing demands = ${fmt(b.kw)} kW, above measured ${fmt(measured ?? 0)} kW`
        : b.by === "minimum"
          ? `minimum ${fmt(b.kw)} kW applies (measured ${fmt(measured ?? 0)} kW)`
          : `${source}`;
    const note = b.by === "measured" ? why : `${why}; ${source}`;
    return { line: line(charge, b.kw, "kW", charge.rate.flat, b.kw * charge.rate.flat, note, status), billingKw: b.kw };
  }

  // Demand inside periods: only windows wholly inside the period count.
  const rates = charge.rate.byPeriod;
  const names = version.periods.map((p) => p.name).filter((n) => n in rates);
  const parts: LinePart[] = [];
  let status: LineStatus = "exact";
  let note: string;
  if (iv && iv.kwh && iv.startMs.length > 0) {
    const byPeriod = maxWindowDemandByPeriodKw(iv.startMs, iv.kwh, iv.intervalMinutes, charge.windowMinutes, st.intervalPeriods(), version.periods.length);
    for (const name of names) {
      const p = version.periods.findIndex((x) => x.name === name);
      let kw = byPeriod[p] ?? 0;
      if (charge.minimumKw !== null && kw < charge.minimumKw) kw = charge.minimumKw;
      parts.push({ label: name, quantity: kw, unit: "kW", rate: rates[name], amount: kw * rates[name] });
    }
    note = `highest ${windowText} average inside each period, from interval data`;
  } else if (req.demandKw != null) {
    const shaped = st.hasShape();
    let overallMax = 0;
    const maxIn = new Array<number>(version.periods.length).fill(0);
    if (shaped) {
      const w = st.hourWeights();
      const idx = st.hourlyPeriods();
      for (let i = 0; i < w.length; i++) {
        if (w[i] > overallMax) overallMax = w[i];
        if (w[i] > maxIn[idx[i]]) maxIn[idx[i]] = w[i];
      }
    }
    for (const name of names) {
      const p = version.periods.findIndex((x) => x.name === name);
      let kw = shaped && overallMax > 0 ? (req.demandKw * maxIn[p]) / overallMax : req.demandKw;
      if (charge.minimumKw !== null && kw < charge.minimumKw) kw = charge.minimumKw;
      parts.push({ label: name, quantity: kw, unit: "kW", rate: rates[name], amount: kw * rates[name] });
    }
    status = shaped ? "estimated" : "needs-interval-data";
    note = shaped
      ? "estimated: billed maximum demand scaled by the load shape's highest hour in each period (no interval data)"
      : "needs interval data: billed maximum demand used for each period (an upper bound)";
  } else {
    for (const name of names) parts.push({ label: name, quantity: 0, unit: "kW", rate: rates[name], amount: 0 });
    status = "needs-interval-data";
    note = "needs interval data: no interval data and no billed demand";
  }
  const amount = sumAmounts(parts.map((p) => p.amount));
  const single = parts.length === 1;
  const detail = parts.map((p) => `${p.label} ${fmt(p.quantity)} kW × ${fmt(p.rate, 6)}`).join(" + ");
  return {
    line: line(charge, single ? parts[0].quantity : null, "kW", single ? parts[0].rate : null, amount, `${detail}; ${note}`, status, parts),
    billingKw: null,
  };
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
          slots[i] = line(charge, base, ctx.tariff.currency, 0, 0, "no power factor given: no adjustment computed", status);
        } else if (pf >= charge.targetPf) {
          slots[i] = line(charge, base, ctx.tariff.currency, 0, 0, `power factor ${fmt(pf)} meets the target ${fmt(charge.targetPf)}`, status);
        } else {
          const factor = charge.targetPf / pf - 1;
          slots[i] = line(
            charge,
            base,
            ctx.tariff.currency,
            factor,
            base * factor,
            `power factor ${fmt(pf)} below ${fmt(charge.targetPf)}: demand charges ${fmt(base, 2)} × (${fmt(charge.targetPf)}/${fmt(pf)} − 1)`,
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
        note: `charges ${subtotal.toFixed(2)} are below the minimum bill ${version.minimumBill.toFixed(2)}`,
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
    ordered.push(line(charge, baseAmount, ctx.tariff.currency, rate, baseAmount * rate, `${fmt(charge.percent)}% of ${baseAmount.toFixed(2)} (${what})`, worstStatus(base.map((l) => l.status))));
  });
  if (minLine !== null) ordered.push(minLine);
  return { lines: ordered, billingDemandKw: billingKw, notes };
}
