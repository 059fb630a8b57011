/**
 * The printable claim sheet of one dispute (claims/<id>.html): what is wrong, for each bill the
 * printed lines beside the corrected ones, the corrected bill's arithmetic and the quantities
 * it rests on, and the cautions. One page a person prints or saves as PDF and attaches to a
 * message to the utility. A back-billing risk gets the same sheet worded as a budget note.
 */
import type { Building, Portfolio } from "../domain/types.ts";
import type { Dispute, DisputeBill, DisputeLine } from "../disputes/index.ts";
import type { ClaimBill, ClaimSheet, FootedTable } from "./disputeModels.ts";
import type { LabelValue, TableCell, TableModel } from "./siteModel.ts";
import { NOT_AVAILABLE, formatDate, formatMoney, formatMoneySigned, formatNumber, formatPercent, formatPeriod, formatRate } from "./format.ts";
import { DISPUTES_PATH, billAnchor, buildingPath, claimPath, meterBillsPath, navFor } from "./nav.ts";
import { checkTitle, lineStatusLabel } from "./labels.ts";
import { BACK_BILL_CAUTION, DISPUTE_CAUTIONS, basisLabel, basisSentence, billsText, shownAmount } from "./disputesPage.ts";

/** Name and file of a tariff as ingest parsed it, when the portfolio holds one under `tariffId`. */
function tariffText(portfolio: Portfolio, tariffId: string): string {
  const t = portfolio.tariffs.get(tariffId) as { name?: unknown } | undefined;
  return t && typeof t.name === "string" && t.name !== "" ? `${tariffId} (${t.name})` : tariffId;
}

/** The tariff versions a corrected bill was priced under, in words. */
function versionsText(versions: DisputeBill["versions"]): string {
  if (versions.length === 0) return NOT_AVAILABLE;
  return versions
    .map((v) => `version in force from ${formatDate(v.from)}: ${formatNumber(v.days)} billing ${v.days === 1 ? "day" : "days"} (${formatPercent(v.weight)})`)
    .join("; ");
}

function moneyCell(amount: number | null, currency: string, signed = false): TableCell {
  if (amount == null) return { text: NOT_AVAILABLE, tone: "muted" };
  return { text: signed ? formatMoneySigned(amount, currency) : formatMoney(amount, currency), sort: String(amount) };
}

/** "Bill X", or "Period not billed" for the days of a gap (a dispute bill without an id). */
function billName(bill: DisputeBill): string {
  return bill.billId === "" ? "Period not billed" : `Bill ${bill.billId}`;
}

/** Printed lines beside the corrected lines (difference = printed − corrected), bill totals at the foot. */
function linesTable(bill: DisputeBill, currency: string): FootedTable | null {
  if (bill.lines.length === 0) return null;
  const anyPrinted = bill.lines.some((l) => l.printed != null);
  return {
    caption: `${billName(bill)}: ${anyPrinted ? "each printed line beside the corrected line of the same label" : bill.billId === "" ? "the lines the period would have been billed" : "the corrected lines (the bill has no printed lines on file)"}, in ${currency}`,
    sortable: false,
    columns: [
      { label: "Line", numeric: false },
      { label: "Printed", numeric: true },
      { label: "Corrected", numeric: true },
      { label: "Difference (printed − corrected)", numeric: true },
    ],
    rows: bill.lines.map((l) => [
      { text: l.label },
      moneyCell(l.printed, currency),
      moneyCell(l.corrected, currency),
      l.difference == null ? { text: NOT_AVAILABLE, tone: "muted" } : { ...moneyCell(l.difference, currency, true), tone: l.difference > 0 ? "pos" : l.difference < 0 ? "neg" : undefined },
    ]),
    foot: [
      { text: "Bill total" },
      moneyCell(bill.billedTotal, currency),
      moneyCell(bill.correctedTotal, currency),
      moneyCell(bill.claimAmount, currency, true),
    ],
  };
}

/** Digits of a quantity on the sheet: enough to redo the arithmetic by hand (349,577.92 kWh, not 349,578). */
const SHEET_DIGITS = 3;

/** A quantity as the sheet prints it: exact to 3 decimals; an amount of money (a tax base) as money. */
function sheetQuantity(value: number | null, unit: string): string {
  if (value == null) return NOT_AVAILABLE;
  return unit ? `${formatNumber(value, SHEET_DIGITS)} ${unit}` : formatNumber(value, SHEET_DIGITS);
}

function lineQuantity(quantity: number, unit: string, currency: string): string {
  return unit === currency ? formatMoney(quantity, currency) : sheetQuantity(quantity, unit);
}

/** A rate per unit; a rate per unit of money (a tax or a percentage charge) as a percentage. */
function lineRate(rate: number, unit: string, currency: string): string {
  return unit === currency ? formatPercent(rate, 4) : formatRate(rate, currency, unit);
}

function arithmeticNote(l: DisputeLine): string {
  const parts: string[] = [];
  if (l.note) parts.push(l.note);
  if (l.status && l.status !== "exact") parts.push(lineStatusLabel(l.status));
  return parts.length ? parts.join("; ") : NOT_AVAILABLE;
}

/** The corrected bill's arithmetic: quantity × rate = amount for each line, with the engine's note. */
function arithmeticTable(bill: DisputeBill, currency: string): TableModel | null {
  const priced = bill.lines.filter((l) => l.corrected != null);
  if (priced.length === 0) return null;
  return {
    caption: `${billName(bill)}: the corrected bill, line by line (quantity × rate = amount)`,
    sortable: false,
    columns: [
      { label: "Line", numeric: false },
      { label: "Quantity", numeric: true },
      { label: "× Rate", numeric: true },
      { label: "= Amount", numeric: true },
      { label: "How it was computed", numeric: false },
    ],
    rows: priced.map((l) => [
      { text: l.label },
      { text: l.quantity == null ? NOT_AVAILABLE : lineQuantity(l.quantity, l.unit, currency), tone: l.quantity == null ? ("muted" as const) : undefined },
      { text: l.rate == null ? NOT_AVAILABLE : lineRate(l.rate, l.unit, currency), tone: l.rate == null ? ("muted" as const) : undefined },
      moneyCell(l.corrected, currency),
      { text: arithmeticNote(l) },
    ]),
  };
}

/** Billed, metered and corrected usage (and demand when any is known). */
function quantitiesTable(bill: DisputeBill): TableModel {
  const rows: TableCell[][] = [
    [
      { text: `Usage (${bill.usageUnit})` },
      { text: sheetQuantity(bill.billedUsage, bill.usageUnit) },
      { text: bill.meteredUsage == null ? "no interval data" : sheetQuantity(bill.meteredUsage, bill.usageUnit), tone: bill.meteredUsage == null ? "muted" : undefined },
      { text: sheetQuantity(bill.correctedUsage, bill.usageUnit) },
    ],
  ];
  if (bill.billedDemandKw != null || bill.meteredDemandKw != null || bill.correctedDemandKw != null) {
    rows.push([
      { text: "Demand (kW)" },
      { text: sheetQuantity(bill.billedDemandKw, "kW") },
      { text: bill.meteredDemandKw == null ? "no interval data" : sheetQuantity(bill.meteredDemandKw, "kW"), tone: bill.meteredDemandKw == null ? "muted" : undefined },
      { text: sheetQuantity(bill.correctedDemandKw, "kW") },
    ]);
  }
  return {
    caption: `${billName(bill)}: usage and demand as billed, as the meter recorded and as the corrected bill was priced${bill.correctedDemandKw != null ? " (billing demand, after any ratchet or minimum)" : ""}`,
    sortable: false,
    columns: [
      { label: "Quantity", numeric: false },
      { label: "On the bill", numeric: true },
      { label: "Interval meter", numeric: true },
      { label: "Corrected bill", numeric: true },
    ],
    rows,
  };
}

function readTypeText(r: DisputeBill["readType"]): string {
  return r === "actual" ? "actual read" : r === "estimated" ? "estimated read" : NOT_AVAILABLE;
}

function claimBill(d: Dispute, bill: DisputeBill, portfolio: Portfolio): ClaimBill {
  const currency = portfolio.settings.currency;
  const name = billName(bill);
  const lines = linesTable(bill, currency);
  const facts: LabelValue[] = [
    // With a line table the totals stand at its foot.
    ...(lines
      ? []
      : [
          { label: "Billed total", value: formatMoney(bill.billedTotal, currency) },
          { label: "Corrected total", value: formatMoney(bill.correctedTotal, currency) },
          { label: "Difference (billed − corrected)", value: formatMoneySigned(bill.claimAmount, currency) },
        ]),
    { label: "Meter read", value: readTypeText(bill.readType) },
    { label: "Tariff", value: tariffText(portfolio, bill.tariffId) },
    { label: "Tariff versions applied", value: versionsText(bill.versions) },
    { label: "Corrected bill priced on", value: bill.correctedOn },
  ];
  return {
    billId: bill.billId,
    anchor: bill.billId === "" ? "bill-unbilled" : billAnchor(bill.billId),
    heading: `${name}, ${formatPeriod(bill.periodStart, bill.periodEnd)}`,
    facts,
    lines,
    arithmetic: arithmeticTable(bill, currency),
    quantities: quantitiesTable(bill),
    notes: bill.notes,
    billsHref: `${meterBillsPath(d.buildingId, d.meterId)}${bill.billId === "" ? "" : `#${billAnchor(bill.billId)}`}`,
  };
}

/**
 * The claim sheet of one dispute. `buildDate` is the readable build date printed on the sheet.
 * @example buildClaimSheet(dispute, portfolio, "Jan 15, 2026").path // "claims/D-1.html"
 */
export function buildClaimSheet(d: Dispute, portfolio: Portfolio, building: Building | undefined, buildDate: string): Omit<ClaimSheet, "canonical"> {
  const currency = portfolio.settings.currency;
  const claim = d.kind === "claim";
  const buildingName = building?.name ?? d.buildingId;
  const bills = billsText(d.billIds);
  const amountLabel = claim ? "Claim (billed − corrected)" : "Not yet billed (corrected − billed)";
  const amount = formatMoney(shownAmount(d), currency);
  const header: LabelValue[] = [
    { label: "Portfolio", value: portfolio.settings.name },
    { label: "Building", value: buildingName },
    { label: "Utility account", value: d.account ?? NOT_AVAILABLE },
    { label: "Meter", value: d.meterId },
    { label: d.billIds.length === 1 ? "Bill" : "Bills", value: bills },
    { label: "Service period", value: formatPeriod(d.periodStart, d.periodEnd) },
    { label: "Billed", value: formatMoney(d.billedTotal, currency) },
    { label: "Corrected", value: formatMoney(d.correctedTotal, currency) },
    { label: "Corrected on", value: basisLabel(d.basis) },
    { label: "Checks", value: d.checks.map(checkTitle).join("; ") || NOT_AVAILABLE },
    { label: "Reference", value: d.disputeId },
    { label: "Prepared", value: buildDate },
  ];
  const root = "../";
  return {
    title: `${claim ? "Claim" : "Budget note"}: ${buildingName}, ${d.billIds.length ? `${d.billIds.length === 1 ? "bill" : "bills"} ${bills}` : `${d.meterId}, ${formatPeriod(d.periodStart, d.periodEnd)}`}`,
    root,
    path: claimPath(d.disputeId),
    // A claim sheet is none of the navigation's pages: no link is marked current.
    nav: navFor("disputes", root).map((l) => ({ ...l, current: false })),
    disputeId: d.disputeId,
    kind: d.kind,
    kindLabel: claim ? "Billing claim" : "Budget note: possible back-billing",
    amountLabel,
    amount,
    what: d.title,
    explanation: d.explanation,
    basisText: basisSentence(d.basis),
    header,
    rangeText: d.correctedRange
      ? `The corrected total is an estimate: between ${formatMoney(d.correctedRange.low, currency)} and ${formatMoney(d.correctedRange.high, currency)}, ${formatMoney(d.correctedTotal, currency)} most likely.`
      : null,
    bills: d.bills.map((b) => claimBill(d, b, portfolio)),
    related: d.relatedBillIds.map((id) => ({ billId: id, href: `${meterBillsPath(d.buildingId, d.meterId)}#${billAnchor(id)}` })),
    notes: d.notes,
    cautions: claim ? [...DISPUTE_CAUTIONS] : [BACK_BILL_CAUTION, DISPUTE_CAUTIONS[1]],
    buildingName,
    buildingHref: buildingPath(d.buildingId),
    meterId: d.meterId,
    meterBillsHref: meterBillsPath(d.buildingId, d.meterId),
    disputesHref: DISPUTES_PATH,
  };
}

/** Claim sheets of every dispute, in the order given. */
export function buildClaimSheets(disputes: readonly Dispute[] | undefined, portfolio: Portfolio, buildDate: string): Omit<ClaimSheet, "canonical">[] {
  const buildings = new Map(portfolio.buildings.map((b) => [b.buildingId, b]));
  return (disputes ?? []).map((d) => buildClaimSheet(d, portfolio, buildings.get(d.buildingId), buildDate));
}
