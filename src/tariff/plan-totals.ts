/**
 * A pricing plan's price without the bill's lines: the total, billing demand and exactness
 * that priceInContext (price.ts) gives for a context without detail, by the same arithmetic in
 * the same order — each charge's amount rounded to the cent from the same unrounded pieces,
 * the minimum bill and percent lines over the same rounded amounts, versions merged by label as
 * mergeLine merges them — but with no line objects, parts, labels or notes made. A forecast
 * prices every month once per scenario and reads only these three figures.
 *
 * Not for interval data that give only the shape (`intervalsGive: "shape"`): plans with it use
 * priceInContext. test/tariff/plan.test.ts checks every figure against priceBill.
 */
import type { Charge, TariffVersion } from "./model.ts";
import type { BillContext } from "./context.ts";
import { MINIMUM_BILL_LABEL } from "./model.ts";
import { billingDemandKw } from "./demand.ts";
import { NO_POWER_FACTOR_NOTE, rateOf, STATUS_RANK } from "./lines.ts";
import { VersionState } from "./version-state.ts";
import { Compensated, roundCents } from "../core/money.ts";

/** A line as far as totals need it: what mergeLine compares and what the total adds. */
interface Amounted {
  label: string;
  demand: boolean;
  quantity: number | null;
  rate: number | null;
  amount: number;
  /** 0 exact, 1 estimated, 2 needs interval data (worstStatus's order). */
  status: number;
  /** The one note a line carries without detail (no power factor given), else null. */
  note: string | null;
}

/** What a version's charges need that does not depend on the quantities, made once per plan. */
interface PreparedVersion {
  version: TariffVersion;
  /** Per charge: time-of-use energy rates by period index, or per-period demand (period indices and rates). */
  energyRates: (number[] | null)[];
  demandPeriods: ({ index: number[]; rate: number[] } | null)[];
  /** Highest hour weight overall and in each period (estimated period demand without intervals), lazily. */
  hourPeaks: { overall: number; byPeriod: number[] } | null;
}

export interface VersionsInForce {
  versions: PreparedVersion[];
  days: number[];
}

/** Prepares the versions in force of a plan (usage-independent rates and period indices). */
export function prepareVersions(inForce: readonly { version: TariffVersion; days: number }[]): VersionsInForce {
  return {
    versions: inForce.map(({ version }) => ({
      version,
      energyRates: version.charges.map((c) => (c.kind === "energy" && !("flat" in c.rate) ? version.periods.map((p) => rateOf(c.rate, p.name) ?? 0) : null)),
      demandPeriods: version.charges.map((c) => {
        if (c.kind !== "demand" || "flat" in c.rate) return null;
        const rates = c.rate.byPeriod;
        const names = version.periods.map((p) => p.name).filter((n) => n in rates);
        return { index: names.map((n) => version.periods.findIndex((x) => x.name === n)), rate: names.map((n) => rates[n]!) };
      }),
      hourPeaks: null,
    })),
    days: inForce.map((x) => x.days),
  };
}

/**
 * Total, billing demand and exactness of the bill in `ctx` (built without detail) under the
 * prepared versions: priceInContext's figures.
 * @throws PricingError as priceInContext (a demand window that does not fit the interval length).
 */
export function plannedTotals(ctx: BillContext, prepared: VersionsInForce): { total: number; billingDemandKw: number | null; exact: boolean } {
  const n = prepared.versions.length;
  const acc = new Compensated();
  if (n === 1) {
    const r = versionLines(ctx, prepared.versions[0]!, acc);
    const { total, exact } = linesTotal(r.lines, acc);
    let billingDemandKw: number | null = null;
    if (r.billingKw !== null) {
      acc.reset();
      acc.add(r.billingKw * (prepared.days[0]! / ctx.days));
      billingDemandKw = acc.total();
    }
    return { total, billingDemandKw, exact };
  }
  const results: Amounted[][] = [];
  const billing: (number | null)[] = [];
  for (let v = 0; v < n; v++) {
    const r = versionLines(ctx, prepared.versions[v]!, acc);
    results.push(r.lines);
    billing.push(r.billingKw);
  }
  const weights = prepared.days.map((days) => days / ctx.days);
  const { total, exact } = linesTotal(mergeByLabel(results, weights), acc);
  let anyDemand = false;
  for (const b of billing) if (b !== null) anyDemand = true;
  if (!anyDemand) return { total, billingDemandKw: null, exact };
  acc.reset();
  for (let i = 0; i < n; i++) acc.add((billing[i] ?? 0) * weights[i]!);
  return { total, billingDemandKw: acc.total(), exact };
}

/** The bill's total (its lines' amounts added as sumAmounts adds them, rounded) and whether every line is exact. */
function linesTotal(lines: readonly Amounted[], acc: Compensated): { total: number; exact: boolean } {
  acc.reset();
  let exact = true;
  for (const l of lines) {
    acc.add(l.amount);
    if (l.status !== 0) exact = false;
  }
  return { total: roundCents(acc.total()), exact };
}

/** mergeLine of price.ts without detail, for every label in order of first appearance. */
function mergeByLabel(results: readonly Amounted[][], weights: readonly number[]): Amounted[] {
  const labels: string[] = [];
  for (const r of results) for (const l of r) if (!labels.includes(l.label)) labels.push(l.label);
  return labels.map((label) => {
    const present = results.map((r) => r.find((l) => l.label === label) ?? null);
    const first = present.find((l) => l !== null)!;
    const same = present.every((l) => l !== null && l.amount === first.amount && l.quantity === first.quantity && l.rate === first.rate && l.note === first.note);
    if (same) return first;
    let amount = 0;
    let status = 0;
    present.forEach((l, i) => {
      if (l === null) return;
      amount += l.amount * weights[i]!;
      if (l.status > status) status = l.status;
    });
    return { label, demand: first.demand, quantity: null, rate: null, amount: roundCents(amount), status, note: null };
  });
}

function amounted(charge: Charge, quantity: number | null, rate: number | null, amount: number, status: number, note: string | null = null): Amounted {
  return { label: charge.label, demand: charge.kind === "demand", quantity, rate, amount: roundCents(amount), status, note };
}

/** priceVersion without detail: the lines' amounts, quantities, rates and statuses, and the billing demand. */
function versionLines(ctx: BillContext, pv: PreparedVersion, pieces: Compensated): { lines: Amounted[]; billingKw: number | null } {
  const { version } = pv;
  const st = new VersionState(ctx, version);
  const prev = ctx.req.previousBillingDemandsKw ?? [];
  const charges = version.charges;
  const slots: (Amounted | null)[] = new Array(charges.length).fill(null);
  let billingKw: number | null = null;
  for (let i = 0; i < charges.length; i++) {
    const charge = charges[i]!;
    switch (charge.kind) {
      case "fixed":
        slots[i] = amounted(charge, 1, charge.amount, charge.amount, 0);
        break;
      case "blocks": {
        const scale = charge.scaleByDays ? ctx.days / 30 : 1;
        pieces.reset();
        let firstRate = 0;
        let lower = 0;
        let remaining = ctx.usage;
        for (let b = 0; b < charge.blocks.length; b++) {
          const block = charge.blocks[b]!;
          const upper = block.upTo === null ? Infinity : block.upTo * scale;
          const q = b === 0 && remaining < 0 ? remaining : Math.max(0, Math.min(remaining, upper - lower));
          if (q !== 0 || b === 0) {
            if (pieces.count === 0) firstRate = block.rate;
            pieces.add(q * block.rate);
          }
          remaining -= q;
          lower = upper;
        }
        slots[i] = amounted(charge, ctx.usage, pieces.count === 1 ? firstRate : null, pieces.total(), 0);
        break;
      }
      case "energy": {
        if ("flat" in charge.rate) {
          slots[i] = amounted(charge, ctx.usage, charge.rate.flat, ctx.usage * charge.rate.flat, 0);
          break;
        }
        const split = st.periodSplit();
        const rates = pv.energyRates[i]!;
        pieces.reset();
        for (let p = 0; p < rates.length; p++) pieces.add(split.usage[p]! * rates[p]!);
        slots[i] = amounted(charge, split.total, null, pieces.total(), STATUS_RANK[split.status]);
        break;
      }
      case "demand": {
        if ("flat" in charge.rate) {
          const iv = ctx.intervals;
          let measured: number | null = null;
          if (iv && iv.kwh && iv.startMs.length > 0) measured = st.windowDemand(charge.windowMinutes).kw;
          if (measured === null && ctx.req.demandKw != null) measured = ctx.req.demandKw;
          const status = measured === null ? 2 : 0;
          const b = billingDemandKw(measured ?? 0, prev, charge.ratchet, charge.minimumKw);
          slots[i] = amounted(charge, b.kw, charge.rate.flat, b.kw * charge.rate.flat, status);
          if (billingKw === null) billingKw = b.kw;
          break;
        }
        slots[i] = periodDemand(st, pv, charge, pv.demandPeriods[i]!, pieces);
        break;
      }
      case "power-factor": {
        pieces.reset();
        let status = 0;
        for (let j = 0; j < i; j++) {
          const l = slots[j];
          if (l === null || !l!.demand) continue;
          pieces.add(l!.amount);
          if (l!.status > status) status = l!.status;
        }
        const base = pieces.total();
        const pf = ctx.req.powerFactor;
        if (pf == null) slots[i] = amounted(charge, base, 0, 0, status, NO_POWER_FACTOR_NOTE);
        else if (pf >= charge.targetPf) slots[i] = amounted(charge, base, 0, 0, status);
        else {
          const factor = charge.targetPf / pf - 1;
          slots[i] = amounted(charge, base, factor, base * factor, status);
        }
        break;
      }
      case "percent":
        break; // after the minimum bill
      default: {
        // A new charge kind must be priced here as in priceVersion (price-version.ts).
        const unknown: never = charge;
        throw new Error(`plan-totals: charge kind of ${JSON.stringify(unknown)} is not priced`);
      }
    }
  }

  let minLine: Amounted | null = null;
  if (version.minimumBill !== null) {
    pieces.reset();
    let status = 0;
    for (const l of slots) {
      if (l === null) continue;
      pieces.add(l.amount);
      if (l.status > status) status = l.status;
    }
    const subtotal = roundCents(pieces.total());
    if (subtotal < version.minimumBill) {
      const amount = roundCents(version.minimumBill - subtotal);
      minLine = { label: MINIMUM_BILL_LABEL, demand: false, quantity: 1, rate: amount, amount, status, note: null };
    }
  }
  const ordered: Amounted[] = [];
  for (let i = 0; i < charges.length; i++) {
    const charge = charges[i]!;
    if (charge.kind !== "percent") {
      ordered.push(slots[i]!);
      continue;
    }
    if (minLine !== null) {
      ordered.push(minLine);
      minLine = null;
    }
    pieces.reset();
    let status = 0;
    for (const l of ordered) {
      if (charge.of !== "all" && !charge.of.includes(l.label)) continue;
      pieces.add(l.amount);
      if (l.status > status) status = l.status;
    }
    const baseAmount = roundCents(pieces.total());
    const rate = charge.percent / 100;
    ordered.push(amounted(charge, baseAmount, rate, baseAmount * rate, status));
  }
  if (minLine !== null) ordered.push(minLine);
  return { lines: ordered, billingKw };
}

/** A per-period demand charge (priceDemand's second half, without billed-demand scaling: no shape mode here). */
function periodDemand(st: VersionState, pv: PreparedVersion, charge: Extract<Charge, { kind: "demand" }>, periods: { index: number[]; rate: number[] }, pieces: Compensated): Amounted {
  const { ctx } = st;
  const iv = ctx.intervals;
  const demandKw = ctx.req.demandKw;
  const count = periods.index.length;
  // the line shows a quantity only for a single period: its billed kW
  let firstKw = 0;
  pieces.reset();
  let status: number;
  if ((iv && iv.kwh && iv.startMs.length > 0) || demandKw != null) {
    const fromIntervals = !!(iv && iv.kwh && iv.startMs.length > 0);
    const byPeriod = fromIntervals ? st.windowDemandByPeriod(charge.windowMinutes) : null;
    const shaped = !fromIntervals && st.hasShape();
    const peaks = shaped ? hourPeaksOf(st, pv) : null;
    for (let j = 0; j < count; j++) {
      const p = periods.index[j]!;
      let kw = byPeriod !== null ? (byPeriod[p] ?? 0) : peaks !== null && peaks.overall > 0 ? (demandKw! * peaks.byPeriod[p]!) / peaks.overall : demandKw!;
      if (charge.minimumKw !== null && kw < charge.minimumKw) kw = charge.minimumKw;
      if (j === 0) firstKw = kw;
      pieces.add(kw * periods.rate[j]!);
    }
    status = fromIntervals ? 0 : shaped ? 1 : 2;
  } else {
    for (let j = 0; j < count; j++) pieces.add(0);
    status = 2;
  }
  const single = count === 1;
  return amounted(charge, single ? firstKw : null, single ? periods.rate[0]! : null, pieces.total(), status);
}

/** Highest hour weight overall and inside each period (usage-independent: once per plan and version). */
function hourPeaksOf(st: VersionState, pv: PreparedVersion): { overall: number; byPeriod: number[] } {
  if (pv.hourPeaks !== null) return pv.hourPeaks;
  const w = st.hourWeights();
  const idx = st.hourlyPeriods();
  let overall = 0;
  const byPeriod = new Array<number>(pv.version.periods.length).fill(0);
  for (let i = 0; i < w.length; i++) {
    if (w[i]! > overall) overall = w[i]!;
    if (w[i]! > byPeriod[idx[i]!]!) byPeriod[idx[i]!] = w[i]!;
  }
  return (pv.hourPeaks = { overall, byPeriod });
}
