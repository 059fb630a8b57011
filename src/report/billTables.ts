/**
 * A meter's bills: the bills table (billed, re-priced on each basis, the claim, the check state)
 * and each bill's line-by-line re-pricing. A bill has up to two recomputations, each on ONE
 * basis (src/report/input.ts `PricedBill`); they are labelled and never mixed. A difference is
 * shown only for a recomputation that is exact: an estimate is never presented as a difference.
 */
import type { Bill, BillLine, Meter } from "../domain/types.ts";
import type { ComputedBill, ComputedLine } from "../tariff/index.ts";
import type { Dispute } from "../disputes/index.ts";
import type { ReportInput } from "./input.ts";
import { billCheckState, type BillCheckState, type PricedBill } from "../tariff/index.ts";
import type { LabelValue, TableCell, TableColumn, TableModel } from "./siteModel.ts";
import type { BasisMath, BillClaim, BillDetail, MathLine } from "./billPageModels.ts";
import {
  NOT_AVAILABLE,
  formatDate,
  formatMoney,
  formatMoneySigned,
  formatMonth,
  formatNumber,
  formatPercent,
  formatPeriod,
  formatQuantity,
  formatRate,
} from "./format.ts";
import { lineStatusLabel } from "./labels.ts";
import { billAnchor, claimPath, meterBillsPath } from "./nav.ts";
import { groupLines } from "../audit/index.ts";
import { daysBetween } from "../core/time/index.ts";

/** Billed minus a recomputed total, rounded to cents; null when there is no recomputation. */
export function billDifference(bill: Bill, recomputed: ComputedBill | null | undefined): number | null {
  if (!recomputed) return null;
  return Math.round((bill.total - recomputed.total) * 100) / 100;
}

/** Plain-words reason a bill has no recomputed total. */
export function notPricedReason(priced: PricedBill | undefined): string {
  return priced?.error ?? "no pricing result";
}

/**
 * A bill's check state in plain words (never the raw code).
 * @example checkStateText("needs-interval-data", null) // "needs interval data"
 */
export function checkStateText(state: BillCheckState, priced: PricedBill | undefined): string {
  switch (state) {
    case "exact":
      return "re-priced exactly";
    case "estimated":
      // with interval data the split is estimated because the bill's quantities differ from the meter's
      return priced?.metered ? "estimated: the billed quantities differ from the meter, so their time-of-use split is an estimate" : "estimated from the building's load shape";
    case "needs-interval-data":
      return "needs interval data";
    case "not-priced":
      return `not re-priced: ${notPricedReason(priced)}`;
  }
}

/** The recomputation on metered quantities, when there is one. */
function meteredOf(priced: PricedBill | undefined): ComputedBill | null {
  return priced?.metered ?? null;
}

/** Claims and back-billing risks covering a bill, keyed by bill id, each with the dispute's own per-bill figure. */
export function claimsByBill(disputes: readonly Dispute[] | undefined, currency: string): ReadonlyMap<string, readonly BillClaim[]> {
  // Every building and meter page asks for it: made once per dispute list (which no stage changes
  // once made), or the pages' cost would grow with buildings × disputes.
  const key = disputes ?? NO_DISPUTES;
  const kept = claimsCache.get(key);
  if (kept && kept.currency === currency) return kept.byBill;
  const out = new Map<string, BillClaim[]>();
  for (const d of disputes ?? []) {
    for (const b of d.bills) {
      const claim: BillClaim = {
        label: d.kind === "claim" ? "Claim" : "Back-billing risk",
        // The dispute's number as it stands (a risk is negative: billed below the corrected total);
        // the report never recomputes a claim.
        amount: d.kind === "claim" ? formatMoney(b.claimAmount, currency) : formatMoneySigned(b.claimAmount, currency),
        title: d.title,
        href: claimPath(d.disputeId),
      };
      const list = out.get(b.billId);
      if (list) list.push(claim);
      else out.set(b.billId, [claim]);
    }
  }
  claimsCache.set(key, { currency, byBill: out });
  return out;
}
const NO_DISPUTES: readonly Dispute[] = [];
const claimsCache = new WeakMap<readonly Dispute[], { currency: string; byBill: ReadonlyMap<string, readonly BillClaim[]> }>();

/** Raw per-bill claim amounts (for sort keys), keyed by bill id. */
function claimAmounts(disputes: readonly Dispute[] | undefined): Map<string, number[]> {
  const out = new Map<string, number[]>();
  for (const d of disputes ?? []) for (const b of d.bills) out.set(b.billId, [...(out.get(b.billId) ?? []), b.claimAmount]);
  return out;
}

/**
 * A half-open service period as a short table text: the year once when both ends share it.
 * @example shortPeriod("2025-04-08", "2025-05-08") // "Apr 8 – May 7, 2025"
 */
export function shortPeriod(periodStart: string, periodEnd: string): string {
  const full = formatPeriod(periodStart, periodEnd);
  const [from, to] = full.split(" – ");
  const year = from.slice(-6);
  return to.endsWith(year) ? `${from.slice(0, -6)} – ${to}` : full;
}

/** Signed difference cell with its tone; the caller has checked the recomputation is exact. */
function differenceCell(diff: number, currency: string): TableCell {
  return { text: formatMoneySigned(diff, currency), sort: String(diff), tone: diff > 0 ? "pos" : diff < 0 ? "neg" : undefined };
}

/** Options of `billsTable`. */
export interface BillsTableOptions {
  /** Caption of the table. */
  caption?: string;
  /** Name the meter under each bill id (for a table mixing meters). */
  withMeter?: boolean;
}

/**
 * Bills table of one or more bills: the bill (linked to its re-pricing on the meter's bills
 * page), period (days beneath), usage (an estimated read said beneath), demand (when any bill
 * has one), billed, re-priced on billed quantities with its difference, re-priced on metered
 * quantities with its difference (columns only when some bill has that basis), and the claim
 * (column only when some bill has one). A bill that is not exact shows its check state in
 * words where the difference would be. Links are relative to the site root.
 * @example billsTable([meter], bills, input, "USD").columns[0].label // "Bill"
 */
export function billsTable(meters: readonly Meter[], bills: readonly Bill[], input: ReportInput, currency: string, options: BillsTableOptions = {}): TableModel {
  const meterById = new Map(meters.map((m) => [m.meterId, m]));
  const claims = claimsByBill(input.disputes, currency);
  const amounts = claimAmounts(input.disputes);
  const anyMetered = bills.some((b) => meteredOf(input.priced.get(b.billId)) !== null);
  const anyClaim = bills.some((b) => claims.has(b.billId));
  const anyDemand = bills.some((b) => b.demandKw != null);
  const columns: TableColumn[] = [
    { label: "Bill", numeric: false },
    { label: "Service period", numeric: false },
    { label: "Usage", numeric: true },
    ...(anyDemand ? [{ label: "Demand", numeric: true }] : []),
    { label: "Billed", numeric: true },
    { label: "Re-priced on billed quantities", numeric: true },
    { label: "Difference (billed quantities)", numeric: true },
    ...(anyMetered
      ? [
          { label: "Re-priced on metered quantities", numeric: true },
          { label: "Difference (metered quantities)", numeric: true },
        ]
      : []),
    ...(anyClaim ? [{ label: "Claim", numeric: true }] : []),
  ];
  const rows = bills.map((b): TableCell[] => {
    const meter = meterById.get(b.meterId);
    const unit = meter?.unit ?? "";
    const priced = input.priced.get(b.billId);
    const state = billCheckState(priced);
    const computed = priced?.computed ?? null;
    const metered = meteredOf(priced);
    const days = daysBetween(b.periodStart, b.periodEnd);
    const href = `${meterBillsPath(meter?.buildingId ?? "", b.meterId)}#${billAnchor(b.billId)}`;
    const cells: TableCell[] = [{ text: b.billId, href, sort: b.periodStart, note: options.withMeter ? `meter ${b.meterId}` : undefined }];
    cells.push(
      { text: shortPeriod(b.periodStart, b.periodEnd), sort: b.periodStart, note: `${formatNumber(days)} days` },
      b.readType === "estimated"
        ? { text: formatQuantity(b.usage, unit), sort: String(b.usage), note: "estimated read", tone: "warn" }
        : { text: formatQuantity(b.usage, unit), sort: String(b.usage) },
    );
    if (anyDemand) cells.push(b.demandKw == null ? { text: NOT_AVAILABLE, sort: "" } : { text: formatQuantity(b.demandKw, "kW"), sort: String(b.demandKw) });
    cells.push({ text: formatMoney(b.total, currency), sort: String(b.total) });
    // The difference column carries the check state in words whenever there is no exact total
    // to compare: an estimate is shown as such and never as a difference.
    const stateCell: TableCell = { text: checkStateText(state, priced), sort: "", tone: "muted" };
    if (state === "exact") {
      cells.push({ text: formatMoney(computed!.total, currency), sort: String(computed!.total) }, differenceCell(billDifference(b, computed)!, currency));
    } else if (state === "estimated") {
      cells.push({ text: `${formatMoney(computed!.total, currency)} (estimate)`, sort: String(computed!.total), tone: "muted" }, stateCell);
    } else {
      cells.push({ text: NOT_AVAILABLE, sort: "", tone: "muted" }, stateCell);
    }
    if (anyMetered) {
      if (!metered) cells.push({ text: "no interval data", sort: "", tone: "muted" }, { text: NOT_AVAILABLE, sort: "" });
      else if (metered.exact) cells.push({ text: formatMoney(metered.total, currency), sort: String(metered.total) }, differenceCell(billDifference(b, metered)!, currency));
      else cells.push({ text: `${formatMoney(metered.total, currency)} (estimate)`, sort: String(metered.total), tone: "muted" }, { text: "estimated, not compared", sort: "", tone: "muted" });
    }
    if (anyClaim) {
      const mine = claims.get(b.billId);
      if (!mine) cells.push({ text: NOT_AVAILABLE, sort: "" });
      else {
        const raw = amounts.get(b.billId) ?? [];
        cells.push({
          text: mine.map((c) => (mine.length > 1 || c.label !== "Claim" ? `${c.label.toLowerCase()} ${c.amount}` : c.amount)).join("; "),
          sort: String(raw.reduce((s, a) => s + a, 0)),
          href: mine[0].href,
        });
      }
    }
    return cells;
  });
  const meterNames = meters.map((m) => m.meterId).join(", ");
  return {
    caption: options.caption ?? `Bills for meter ${meterNames}: billed and re-priced totals`,
    sortable: true,
    columns,
    rows,
  };
}

/** Quantity cell text of a computed line; percent lines apply to an amount of money, so their unit is the currency. */
function quantityText(l: ComputedLine, currency: string): string {
  if (l.quantity == null) return NOT_AVAILABLE;
  return l.unit === currency ? formatMoney(l.quantity, currency) : formatQuantity(l.quantity, l.unit);
}

function rateText(l: ComputedLine, currency: string): string {
  if (l.rate == null) return NOT_AVAILABLE;
  return l.kind === "percent" ? formatPercent(l.rate, 4) : formatRate(l.rate, currency, l.unit);
}

function mathLine(l: ComputedLine, currency: string): MathLine {
  return {
    label: l.label,
    kind: l.kind,
    quantity: quantityText(l, currency),
    rate: rateText(l, currency),
    amount: formatMoney(l.amount, currency),
    status: lineStatusLabel(l.status),
    note: l.note ?? "",
    printed: "",
    printedDifference: "",
  };
}

/** Tariff facts of a recomputation (versions, billing demand, days). */
function recomputationFacts(bill: Bill, meter: Meter, c: ComputedBill): LabelValue[] {
  const facts: LabelValue[] = [
    { label: "Tariff", value: meter.tariffId },
    { label: "Billing days", value: formatNumber(daysBetween(bill.periodStart, bill.periodEnd)) },
  ];
  if (c.billingDemandKw != null) facts.push({ label: "Billing demand", value: formatQuantity(c.billingDemandKw, "kW") });
  if (c.versions.length > 0) {
    facts.push({
      label: "Tariff versions",
      value: c.versions.map((v) => `from ${formatDate(v.from)}: ${formatNumber(v.days)} days (${formatPercent(v.weight)})`).join("; "),
    });
  }
  return facts;
}

/**
 * Words for a recomputation that is not exact (the worst line status decides). `splitByMeter`:
 * interval data covered the bill, so an estimate comes from splitting quantities the meter does
 * not confirm by the metered shares, not from the building's load shape.
 */
function inexactText(c: ComputedBill, splitByMeter: boolean): string {
  if (c.lines.some((l) => l.status === "needs-interval-data")) return "Not compared with the bill: some charges need interval data that this period does not have.";
  return splitByMeter
    ? "Not compared with the bill: the quantities priced differ from what the meter recorded (or the interval data is incomplete), so their split over time-of-use periods follows the metered shares and this total is an estimate."
    : "Not compared with the bill: time-of-use or period-demand charges were split by the building's load shape, so this total is an estimate.";
}

/**
 * The billed-basis recomputation with the bill's printed lines beside the tariff's lines of the
 * same label (labels matched ignoring case and spaces, as the audit matches them).
 */
function billedBasis(bill: Bill, meter: Meter, c: ComputedBill, printed: readonly BillLine[], currency: string, splitByMeter: boolean): BasisMath {
  const lines: MathLine[] = [];
  const unmatchedPrinted: { label: string; amount: string }[] = [];
  for (const g of groupLines([...printed], c.lines)) {
    if (g.computedLines.length === 0) {
      unmatchedPrinted.push({ label: g.label, amount: formatMoney(g.printed, currency) });
      continue;
    }
    g.computedLines.forEach((l, i) => {
      const line = mathLine(l, currency);
      // The printed amount of a label stands beside the first tariff line of that label.
      if (i === 0 && printed.length > 0) {
        line.printed = g.printed == null ? "not printed" : formatMoney(g.printed, currency);
        if (g.printed != null && g.computed != null && g.exact) {
          const diff = Math.round((g.printed - g.computed) * 100) / 100;
          line.printedDifference = formatMoneySigned(diff, currency);
          line.printedTone = diff > 0 ? "pos" : diff < 0 ? "neg" : undefined;
        }
      }
      lines.push(line);
    });
  }
  return {
    basis: "billed",
    heading: "Re-priced on the billed quantities",
    explanation: "The tariff applied to the usage and demand printed on the bill: checks the arithmetic and the rates.",
    facts: recomputationFacts(bill, meter, c),
    lines,
    showPrinted: printed.length > 0,
    unmatchedPrinted,
    ...comparedTotals(bill, c, currency, splitByMeter),
  };
}

/** Totals of one recomputation against the bill: a difference only when every line is exact, else the state in words. */
function comparedTotals(bill: Bill, c: ComputedBill, currency: string, splitByMeter: boolean): Pick<BasisMath, "total" | "billed" | "difference" | "differenceTone" | "stateText" | "notes"> {
  const diff = billDifference(bill, c)!;
  return {
    total: formatMoney(c.total, currency),
    billed: formatMoney(bill.total, currency),
    difference: c.exact ? formatMoneySigned(diff, currency) : null,
    differenceTone: c.exact ? (diff > 0 ? "pos" : diff < 0 ? "neg" : undefined) : undefined,
    stateText: c.exact ? null : inexactText(c, splitByMeter),
    notes: [...c.notes],
  };
}

/** The metered-basis recomputation (no printed lines beside it: they are on billed quantities). */
function meteredBasis(bill: Bill, meter: Meter, priced: PricedBill, m: ComputedBill, currency: string): BasisMath {
  return {
    basis: "metered",
    heading: "Re-priced on the metered quantities",
    explanation: "The tariff applied to what the interval meter recorded over the same period (multiplier applied): checks the billed quantities.",
    facts: [
      { label: "Usage priced (metered)", value: formatQuantity(priced.meteredUsage ?? null, meter.unit) },
      { label: "Usage billed", value: formatQuantity(bill.usage, meter.unit) },
      ...(priced.meteredDemandKw != null ? [{ label: "Demand priced (metered peak)", value: formatQuantity(priced.meteredDemandKw, "kW") }] : []),
      ...(bill.demandKw != null ? [{ label: "Demand billed", value: formatQuantity(bill.demandKw, "kW") }] : []),
      ...recomputationFacts(bill, meter, m),
    ],
    lines: m.lines.map((l) => mathLine(l, currency)),
    showPrinted: false,
    unmatchedPrinted: [],
    ...comparedTotals(bill, m, currency, true),
  };
}

/**
 * Everything the meter's bills page shows about one bill: facts, claims, and each recomputation
 * (billed basis, then metered basis when present) line by line.
 * @example billDetail(bill, meter, input, lines, claims, "USD").bases.map((b) => b.basis) // ["billed", "metered"]
 */
export function billDetail(
  bill: Bill,
  meter: Meter,
  input: ReportInput,
  printed: readonly BillLine[],
  claims: ReadonlyMap<string, readonly BillClaim[]>,
  currency: string,
): BillDetail {
  const priced = input.priced.get(bill.billId);
  const state = billCheckState(priced);
  const bases: BasisMath[] = [];
  if (priced?.computed) bases.push(billedBasis(bill, meter, priced.computed, printed, currency, priced.metered != null));
  const metered = meteredOf(priced);
  if (priced && metered) bases.push(meteredBasis(bill, meter, priced, metered, currency));
  return {
    billId: bill.billId,
    anchor: billAnchor(bill.billId),
    heading: `Bill ${bill.billId}`,
    period: formatPeriod(bill.periodStart, bill.periodEnd),
    stateText: checkStateText(state, priced),
    facts: [
      { label: "Days", value: formatNumber(daysBetween(bill.periodStart, bill.periodEnd)) },
      { label: "Statement date", value: formatDate(bill.statementDate) },
      { label: "Read", value: bill.readType },
      { label: "Usage billed", value: formatQuantity(bill.usage, meter.unit) },
      ...(bill.demandKw != null ? [{ label: "Demand billed", value: formatQuantity(bill.demandKw, "kW") }] : []),
      { label: "Billed total", value: formatMoney(bill.total, currency) },
    ],
    claims: [...(claims.get(bill.billId) ?? [])],
    bases,
    notPricedReason: priced?.computed ? null : notPricedReason(priced),
  };
}

/** Interval data of one meter by calendar month with coverage; null without interval data. */
export function meteredTable(meter: Meter, input: ReportInput): TableModel | null {
  const months = input.monthlyMetered.get(meter.meterId);
  if (!months || months.length === 0) return null;
  return {
    caption: `Interval data for meter ${meter.meterId} by calendar month (multiplier applied)`,
    sortable: true,
    columns: [
      { label: "Month", numeric: false },
      { label: "Metered usage", numeric: true },
      { label: "Intervals", numeric: true },
      { label: "Coverage", numeric: true },
    ],
    rows: months.map((m) => {
      const coverage = m.expectedIntervals > 0 ? m.intervals / m.expectedIntervals : null;
      return [
        { text: formatMonth(m.month), sort: m.month },
        { text: formatQuantity(m.total, meter.unit), sort: String(m.total) },
        { text: `${formatNumber(m.intervals)} of ${formatNumber(m.expectedIntervals)}`, sort: String(m.intervals) },
        { text: formatPercent(coverage), sort: coverage == null ? "" : String(coverage) },
      ];
    }),
  };
}
