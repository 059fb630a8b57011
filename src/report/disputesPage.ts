/**
 * The dispute list (disputes.html) and the dispute block of the index: every claim (a bill too
 * high, money to recover) and every back-billing risk (a bill too low or days nobody billed),
 * largest first, with the totals a finance reader carries into a budget or a message to the
 * utility. Money comes from the Dispute objects as they are; totals are cent-exact sums.
 */
import type { Building } from "../domain/types.ts";
import type { Dispute, DisputeBasis, DisputeKind } from "../disputes/index.ts";
import type { ReportInput } from "./input.ts";
import type { DisputeRow, DisputesPage, DisputeTable, DisputeTotal, IndexDisputes } from "./disputeModels.ts";
import type { LabelValue } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMoney, formatNumber, formatPeriod } from "./format.ts";
import { DISPUTES_PATH, buildingPath, claimPath, navFor } from "./nav.ts";

/** How many claims the index lists before pointing to the full dispute list. */
export const INDEX_CLAIM_LIMIT = 10;

/**
 * Sum of money amounts, exact to the cent: each amount (already two decimals) is added as whole
 * cents, so the total equals a spreadsheet's sum of the same column in disputes.csv.
 * @example sumCents([0.1, 0.2]) // 0.3 (not 0.30000000000000004)
 */
export function sumCents(amounts: readonly number[]): number {
  let cents = 0;
  for (const a of amounts) cents += Math.round(a * 100);
  return cents / 100;
}

const BASIS_LABELS: Record<DisputeBasis, string> = {
  tariff: "Tariff, on the billed quantities",
  meter: "Interval meter readings",
  duplicate: "Billed twice",
  overlap: "Days already billed",
  gap: "Days no bill covers",
  multiplier: "Wrong meter multiplier",
  "rate-version": "Rate not in force for the period",
};

const BASIS_SENTENCES: Record<DisputeBasis, string> = {
  tariff: "The bill was priced again under its tariff on the usage and demand printed on it, so the difference lies in its charges, rates or arithmetic, not in the quantities.",
  meter: "The bill was priced again on the usage and demand the interval meter recorded over the same service period; the quantities on the bill differ from the meter.",
  duplicate: "The same service was billed twice; the second bill should have been nothing, so its corrected total is zero.",
  overlap: "The bill's period reaches back over days another bill already covered; the corrected total covers only the days not billed before.",
  gap: "No bill covers these days; the corrected total is the expected cost of the period, priced under the tariff from the usage the building's model expects.",
  multiplier: "The bill's usage and demand are a multiple of what the meter recorded, as if a wrong meter multiplier had been applied; the corrected bill uses the meter's own multiplier.",
  "rate-version": "The bill was priced under a version of the tariff that was not in force for its service period; the corrected bill uses the version in force.",
};

/** @example basisLabel("meter") // "Interval meter readings" */
export function basisLabel(basis: DisputeBasis | string): string {
  return BASIS_LABELS[basis as DisputeBasis] ?? basis;
}

/** One sentence on what the corrected total rests on, for the claim sheet and the dispute list's key. */
export function basisSentence(basis: DisputeBasis | string): string {
  return BASIS_SENTENCES[basis as DisputeBasis] ?? "";
}

/** Every basis with its sentence, in the contract's order (outputs.md `basis`). */
export function basisKey(): LabelValue[] {
  return (Object.keys(BASIS_LABELS) as DisputeBasis[]).map((b) => ({ label: BASIS_LABELS[b], value: BASIS_SENTENCES[b] }));
}

/** The cautions every dispute page carries, in our own words. */
export const DISPUTE_CAUTIONS: readonly string[] = [
  "Each item is a lead to verify with the utility, not a verdict: check it against your copy of the bill before you send it.",
  "The tariff approved by the regulator governs. Corrected totals use this portfolio's tariff files, transcribed by hand; where they differ from the approved tariff, the approved tariff is right.",
  "The utility's own dispute procedure applies, including how far back it will correct a bill (its look-back limit), so raise claims promptly.",
];

/** The caution for back-billing risks: a budget note, not a claim. */
export const BACK_BILL_CAUTION =
  "A bill that was too low, or days no bill covered, may be billed later within the limits the utility's rules allow. Plan for the amount; it is not money to claim.";

/** The amount a row shows: the claim for claims, the shortfall (corrected − billed) for back-billing risks. */
export function shownAmount(d: Dispute): number {
  return d.kind === "claim" ? d.claimAmount : -d.claimAmount;
}

/** Disputes of one kind, largest amount first (ties by id, so the order is stable). */
function disputesOfKind(disputes: readonly Dispute[] | undefined, kind: DisputeKind): Dispute[] {
  return (disputes ?? [])
    .filter((d) => d.kind === kind)
    .sort((a, b) => shownAmount(b) - shownAmount(a) || (a.disputeId < b.disputeId ? -1 : a.disputeId > b.disputeId ? 1 : 0));
}

/** Bill ids of a dispute for a table cell. @example billsText(["A", "B"]) // "A, B" */
export function billsText(billIds: readonly string[]): string {
  return billIds.length === 0 ? "none (period not billed)" : billIds.join(", ");
}

/** One dispute as a table row; `buildings` resolves names (the id stands in for an unknown building). */
function disputeRow(d: Dispute, buildings: ReadonlyMap<string, Building>, currency: string): DisputeRow {
  const name = buildings.get(d.buildingId)?.name ?? d.buildingId;
  const amount = shownAmount(d);
  const bills = billsText(d.billIds);
  return {
    disputeId: d.disputeId,
    building: name,
    buildingHref: buildingPath(d.buildingId),
    meter: d.meterId,
    account: d.account ?? NOT_AVAILABLE,
    meterText: d.account ? `Meter ${d.meterId} · account ${d.account}` : `Meter ${d.meterId}`,
    bills,
    period: formatPeriod(d.periodStart, d.periodEnd),
    periodSort: d.periodStart,
    title: d.title,
    billed: formatMoney(d.billedTotal, currency),
    billedSort: String(d.billedTotal),
    corrected: formatMoney(d.correctedTotal, currency),
    correctedSort: String(d.correctedTotal),
    correctedNote: d.correctedRange ? `range ${formatMoney(d.correctedRange.low, currency)} – ${formatMoney(d.correctedRange.high, currency)}` : null,
    amount: formatMoney(amount, currency),
    amountSort: String(amount),
    basis: basisLabel(d.basis),
    sheetHref: claimPath(d.disputeId),
    sheetLabel: d.billIds.length === 0 ? `${d.kind === "claim" ? "Claim sheet" : "Budget note"} for ${d.meterId}, ${formatPeriod(d.periodStart, d.periodEnd)}` : `${d.kind === "claim" ? "Claim sheet" : "Budget note"} for ${d.billIds.length === 1 ? "bill" : "bills"} ${bills}`,
  };
}

function countText(n: number, kind: DisputeKind): string {
  if (n === 0) return kind === "claim" ? "no claims" : "no risks";
  if (kind === "claim") return `${formatNumber(n)} ${n === 1 ? "claim" : "claims"}`;
  return `${formatNumber(n)} ${n === 1 ? "risk" : "risks"}`;
}

function totalRow(label: string, list: readonly Dispute[], currency: string): DisputeTotal {
  const amount = sumCents(list.map(shownAmount));
  return {
    label,
    billed: formatMoney(sumCents(list.map((d) => d.billedTotal)), currency),
    corrected: formatMoney(sumCents(list.map((d) => d.correctedTotal)), currency),
    amount: formatMoney(amount, currency),
    amountSort: String(amount),
  };
}

/**
 * A dispute table of one kind (disputes already filtered and ordered), showing the first `limit`
 * rows. Its footer totals the rows shown and, when cut, all of them.
 * @example disputeTable("claims", "claim", claims, buildings, "USD").totals[0].label // "Total, 3 claims"
 */
export function disputeTable(
  id: string,
  kind: DisputeKind,
  list: readonly Dispute[],
  buildings: ReadonlyMap<string, Building>,
  currency: string,
  limit = Infinity,
): DisputeTable {
  const shown = list.slice(0, limit);
  const cut = shown.length < list.length;
  const totals: DisputeTotal[] = [];
  if (cut) {
    totals.push(totalRow(`Total of these ${formatNumber(shown.length)}`, shown, currency));
    totals.push(totalRow(`Total, all ${countText(list.length, kind)}`, list, currency));
  } else {
    totals.push(totalRow(`Total, ${countText(list.length, kind)}`, list, currency));
  }
  const claim = kind === "claim";
  return {
    id,
    kind,
    caption: claim
      ? `Bills to dispute${cut ? `: the ${formatNumber(shown.length)} largest of ${formatNumber(list.length)} claims` : ""}, largest claim first. Claim = billed − corrected, in ${currency}.`
      : `Budget risk: bills too low or periods not billed${cut ? `: the ${formatNumber(shown.length)} largest of ${formatNumber(list.length)} risks` : ""}, largest first. Not yet billed = corrected − billed, in ${currency}; the utility may bill it later.`,
    amountLabel: claim ? "Claim" : "Not yet billed",
    rows: shown.map((d) => disputeRow(d, buildings, currency)),
    totals,
  };
}

function buildingMap(input: ReportInput): Map<string, Building> {
  return new Map(input.portfolio.buildings.map((b) => [b.buildingId, b]));
}

function distinctBills(list: readonly Dispute[]): number {
  return new Set(list.flatMap((d) => d.billIds)).size;
}

/** "Showing the 10 largest of 14 claims." when the index cuts a list of `count`, else null. */
function cutText(count: number, noun: string): string | null {
  return count > INDEX_CLAIM_LIMIT ? `Showing the ${formatNumber(INDEX_CLAIM_LIMIT)} largest of ${formatNumber(count)} ${noun}.` : null;
}

/**
 * The index's dispute block: the claim total (the sum of `claimAmount` over kind `claim`, the
 * same figure as the dispute list and disputes.csv), the largest claims and the largest
 * back-billing risks (every one is on the dispute list). Null when the dispute stage did not run.
 * @example buildIndexDisputes(input)?.claimTotal // "$24,967.83"
 */
export function buildIndexDisputes(input: ReportInput): IndexDisputes | null {
  if (!input.disputes) return null;
  const currency = input.portfolio.settings.currency;
  const buildings = buildingMap(input);
  const claims = disputesOfKind(input.disputes, "claim");
  const risks = disputesOfKind(input.disputes, "back-bill-risk");
  const bills = distinctBills(claims);
  return {
    claimTotal: formatMoney(sumCents(claims.map((d) => d.claimAmount)), currency),
    claimCount: claims.length === 0 ? countText(0, "claim") : `${countText(claims.length, "claim")} covering ${formatNumber(bills)} ${bills === 1 ? "bill" : "bills"}`,
    riskTotal: formatMoney(sumCents(risks.map(shownAmount)), currency),
    riskCount: countText(risks.length, "back-bill-risk"),
    href: DISPUTES_PATH,
    claims: claims.length ? disputeTable("index-claims", "claim", claims, buildings, currency, INDEX_CLAIM_LIMIT) : null,
    moreText: cutText(claims.length, "claims"),
    risks: risks.length ? disputeTable("index-risks", "back-bill-risk", risks, buildings, currency, INDEX_CLAIM_LIMIT) : null,
    riskMoreText: cutText(risks.length, "risks"),
  };
}

/**
 * The dispute list page: every claim and every back-billing risk with totals, the key to the
 * bases and the cautions. `downloads` is filled by the site writer from the files it writes.
 * @example buildDisputesPage(input).path // "disputes.html"
 */
export function buildDisputesPage(input: ReportInput): Omit<DisputesPage, "canonical"> {
  const currency = input.portfolio.settings.currency;
  const buildings = buildingMap(input);
  const claims = disputesOfKind(input.disputes, "claim");
  const risks = disputesOfKind(input.disputes, "back-bill-risk");
  const bills = distinctBills(claims);
  const summary: LabelValue[] = [
    { label: "Bills to dispute (total of the claims)", value: formatMoney(sumCents(claims.map((d) => d.claimAmount)), currency) },
    { label: "Claims", value: claims.length ? `${formatNumber(claims.length)} covering ${formatNumber(bills)} ${bills === 1 ? "bill" : "bills"}` : "none" },
    { label: "Budget risk: may be billed later", value: formatMoney(sumCents(risks.map(shownAmount)), currency) },
    { label: "Back-billing risks", value: risks.length ? formatNumber(risks.length) : "none" },
  ];
  return {
    title: "Bills to dispute",
    root: "",
    path: DISPUTES_PATH,
    nav: navFor("disputes", ""),
    lede: input.disputes
      ? "Every bill the audit's evidence says should be corrected: what was billed, what the bill should have been under its tariff, and the difference. Each has a claim sheet with the evidence, to print or save as PDF and send to the utility."
      : "The bill audit did not run for this build, so there is no list of bills to dispute.",
    summary,
    claims: claims.length ? disputeTable("claims", "claim", claims, buildings, currency) : null,
    risks: risks.length ? disputeTable("risks", "back-bill-risk", risks, buildings, currency) : null,
    cautions: [...DISPUTE_CAUTIONS, BACK_BILL_CAUTION],
    downloads: [],
    bases: basisKey(),
  };
}
