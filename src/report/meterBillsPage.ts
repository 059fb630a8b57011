/**
 * View model of a meter's page (bills/<building>/<meter>.html): the meter's facts, its bills
 * table, the line-by-line re-pricing of every bill on each basis with the printed lines beside
 * the tariff's, its interval data by month, its weather baseline and its data quality. Keeps
 * the per-bill detail off the building page, which links here.
 */
import type { BillLine, Meter } from "../domain/types.ts";
import type { ReportInput } from "./input.ts";
import type { BaselineSection, QualitySection } from "./siteModel.ts";
import type { BillClaim, MeterBillsPage } from "./billPageModels.ts";
import type { BuildingContext } from "./buildingPage.ts";
import { NOT_AVAILABLE, formatMoney, formatMoneySigned, formatNumber } from "./format.ts";
import { buildingPath, claimPath, meterBillsPath, navFor } from "./nav.ts";
import { commodityLabel } from "./labels.ts";
import { billDetail, billsTable, claimsByBill, meteredTable } from "./billTables.ts";
import { baselineSections } from "./baselineSection.ts";
import { qualitySections } from "./qualitySection.ts";

/** Weather baseline and data-quality sections of a building's meters, keyed by meter id (computed once, shared by the building and meter pages). */
export interface MeterAnalysis {
  baselines: Map<string, BaselineSection>;
  quality: Map<string, QualitySection>;
}

/** The baseline and quality sections of every meter of a building, keyed by meter id. */
export function meterAnalysis(input: ReportInput, ctx: BuildingContext): MeterAnalysis {
  return {
    baselines: new Map(baselineSections(ctx.meters, input.baselines, ctx.billsByMeter).map((s) => [s.meterId, s])),
    quality: new Map(qualitySections(ctx.building, ctx.meters, input.quality, input.portfolio.intervals).map((s) => [s.meterId, s])),
  };
}

/** Printed bill lines (bill_lines.csv) keyed by bill id, in file order. */
export function billLinesByBill(lines: readonly BillLine[]): Map<string, BillLine[]> {
  const out = new Map<string, BillLine[]>();
  for (const l of lines) {
    const list = out.get(l.billId);
    if (list) list.push(l);
    else out.set(l.billId, [l]);
  }
  return out;
}

/** The facts of a meter as both pages show them. */
function meterFacts(m: Meter) {
  return [
    { label: "Commodity", value: commodityLabel(m.commodity) },
    { label: "Bill unit", value: m.unit },
    { label: "Tariff", value: m.tariffId },
    { label: "Multiplier", value: formatNumber(m.multiplier, 4) },
    { label: "Account", value: m.account ?? NOT_AVAILABLE },
  ];
}

/**
 * Builds the page of one meter's bills. Page links are relative: the page sits two folders
 * down (`bills/<building>/<meter>.html`), so its root is "../../".
 * @example buildMeterBillsPage(input, ctx, meter, analysis, lines).path // "bills/B1/E1.html"
 */
export function buildMeterBillsPage(
  input: ReportInput,
  ctx: BuildingContext,
  meter: Meter,
  analysis: MeterAnalysis,
  linesByBill: ReadonlyMap<string, BillLine[]>,
): Omit<MeterBillsPage, "canonical"> {
  const { building: b, currency } = ctx;
  const root = "../../";
  const bills = ctx.billsByMeter.get(meter.meterId) ?? [];
  const claims = claimsByBill(input.disputes, currency);
  const billIds = new Set(bills.map((x) => x.billId));
  // Claims on this meter that cover none of its bills (a period nobody billed): listed on their own.
  const otherClaims: BillClaim[] = (input.disputes ?? [])
    .filter((d) => d.meterId === meter.meterId && d.buildingId === b.buildingId && !d.bills.some((x) => billIds.has(x.billId)))
    .map((d) => ({
      label: d.kind === "claim" ? "Claim" : "Back-billing risk",
      amount: d.kind === "claim" ? formatMoney(d.claimAmount, currency) : formatMoneySigned(d.claimAmount, currency),
      title: d.title,
      href: claimPath(d.disputeId),
    }));
  const hasPrinted = bills.some((x) => linesByBill.has(x.billId));
  const hasMetered = bills.some((x) => input.priced.get(x.billId)?.metered);
  const key = [
    "Re-priced on billed quantities: the tariff applied to the usage and demand printed on the bill; it checks the arithmetic and the rates.",
    ...(hasMetered
      ? ["Re-priced on metered quantities: the tariff applied to what the interval meter recorded over the same days; it checks the quantities. The two are never mixed inside one total."]
      : []),
    "A difference is billed minus re-priced: positive means the bill is higher than the tariff gives. A bill on a time-of-use or period-demand charge cannot be re-priced exactly on its billed quantities when there is no interval data, or when the billed quantities differ from what the meter recorded (the split over periods is then an estimate): it shows that state in words instead of a difference.",
    ...(input.disputes ? ["The claim is the amount of the dispute the bill belongs to, as the list of bills to dispute states it; it links to the claim sheet."] : []),
  ];
  return {
    title: `${commodityLabel(meter.commodity)} meter ${meter.meterId}: bills`,
    root,
    nav: navFor("building", root),
    path: meterBillsPath(b.buildingId, meter.meterId),
    buildingId: b.buildingId,
    meterId: meter.meterId,
    buildingName: b.name,
    buildingHref: buildingPath(b.buildingId),
    lede: `${formatNumber(bills.length)} bills of ${b.name}, each re-priced from tariff ${meter.tariffId}${hasPrinted ? ", with the charges printed on the bill beside the tariff's" : ""}.`,
    facts: meterFacts(meter),
    billsTable: billsTable([meter], bills, input, currency),
    billsKey: key,
    bills: bills.map((bill) => billDetail(bill, meter, input, linesByBill.get(bill.billId) ?? [], claims, currency)),
    otherClaims,
    meteredTable: meteredTable(meter, input),
    baseline: analysis.baselines.get(meter.meterId) ?? null,
    quality: analysis.quality.get(meter.meterId) ?? null,
  };
}
