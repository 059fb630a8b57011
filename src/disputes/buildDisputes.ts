/**
 * From audit findings to claims: every finding that puts money on a bill (it carries corrected
 * bills) becomes one dispute; findings that are not about the bill's money (an unusual but real
 * use, an estimated read) stay findings only. Pure: no I/O, no clock.
 *
 * One root cause is one dispute (the audit already merged cascades, see src/audit/dedupe.ts);
 * if two disputes still name the same bill, the larger keeps it and the other becomes a note,
 * so a bill is never claimed twice. claim = billed − corrected, to the cent, from the same
 * corrected bills as the finding's amount: the finding, the bills table and disputes.csv agree.
 */
import type { Bill, BillLine, Meter } from "../domain/types.ts";
import type { CorrectedBill, Finding } from "../audit/index.ts";
import { groupLines } from "../audit/index.ts";
import { claimOf } from "../audit/index.ts";
import type { Dispute, DisputeBasis, DisputeBill, DisputeLine } from "./types.ts";
import { moneyText, roundCents } from "../core/money.ts";
import { fnv1a32 } from "../core/random.ts";

/** The basis a check's corrected total rests on (outputs.md `basis`). */
export const BASIS_OF_CHECK: Partial<Record<string, DisputeBasis>> = {
  "total-mismatch": "tariff",
  "line-mismatch": "tariff",
  "unexplained-line": "tariff",
  "usage-vs-meter": "meter",
  "demand-vs-meter": "meter",
  "multiplier-suspect": "multiplier",
  "duplicate-bill": "duplicate",
  "period-overlap": "overlap",
  "period-gap": "gap",
  "missing-bill": "gap",
  "rate-suspect": "rate-version",
};

export interface DisputeInput {
  findings: readonly Finding[];
  bills: readonly Bill[];
  meters: readonly Meter[];
  billLines: readonly BillLine[];
  /** Metered usage and peak per bill id, when the meter has interval data covering the bill. */
  metered?: ReadonlyMap<string, { usage: number | null; peakKw: number | null }>;
}

const round2 = roundCents;

/** FNV-1a, 32 bits, as 8 hex digits: a short stable id from the dispute's identity. */
function hash32(text: string): string {
  return fnv1a32(text).toString(16).padStart(8, "0");
}

function disputeLines(printed: readonly BillLine[], c: CorrectedBill): DisputeLine[] {
  if (!c.corrected) {
    return printed.map((l) => ({ label: l.label, printed: round2(l.amount), corrected: null, difference: null, quantity: null, unit: "", rate: null, note: null, status: null }));
  }
  return groupLines([...printed], c.corrected.lines).map((g) => {
    const one = g.computedLines.length === 1 ? g.computedLines[0] : null;
    return {
      label: g.label,
      printed: g.printed === null ? null : round2(g.printed),
      corrected: g.computed === null ? null : round2(g.computed),
      difference: g.printed !== null && g.computed !== null ? round2(g.printed - g.computed) : null,
      quantity: one?.quantity ?? null,
      unit: one?.unit ?? "",
      rate: one?.rate ?? null,
      note: g.computedLines.map((l) => l.note).filter((n): n is string => !!n).join("; ") || null,
      status: g.computedLines.length === 0 ? null : g.exact ? "exact" : (g.computedLines.find((l) => l.status !== "exact")?.status ?? "estimated"),
    };
  });
}

function disputeBill(c: CorrectedBill, bill: Bill | undefined, meter: Meter, printed: readonly BillLine[], metered: { usage: number | null; peakKw: number | null } | undefined): DisputeBill {
  return {
    billId: c.billId ?? "",
    periodStart: c.periodStart,
    periodEnd: c.periodEnd,
    billedTotal: round2(c.billedTotal),
    correctedTotal: round2(c.correctedTotal),
    claimAmount: round2(c.billedTotal - c.correctedTotal),
    readType: bill?.readType ?? null,
    usageUnit: meter.unit,
    billedUsage: bill?.usage ?? null,
    meteredUsage: metered?.usage ?? null,
    correctedUsage: c.usage,
    billedDemandKw: bill?.demandKw ?? null,
    meteredDemandKw: metered?.peakKw ?? null,
    correctedDemandKw: c.corrected?.billingDemandKw ?? null,
    tariffId: meter.tariffId,
    versions: c.corrected?.versions ?? [],
    lines: disputeLines(printed, c),
    notes: c.corrected?.notes ?? [],
    correctedOn: c.correctedOn,
  };
}

/**
 * Disputes of a set of findings: claims (bill too high) largest first, then back-billing risks
 * (too low, or not billed) largest first.
 * @example buildDisputes({ findings, bills, meters, billLines }).filter((d) => d.kind === "claim")
 */
export function buildDisputes(input: DisputeInput): Dispute[] {
  const bills = new Map(input.bills.map((b) => [b.billId, b]));
  const meters = new Map(input.meters.map((m) => [m.meterId, m]));
  const lines = new Map<string, BillLine[]>();
  for (const l of input.billLines) {
    const list = lines.get(l.billId);
    if (list) list.push(l);
    else lines.set(l.billId, [l]);
  }

  const candidates: Dispute[] = [];
  for (const f of input.findings) {
    const basis = BASIS_OF_CHECK[f.check];
    const meter = meters.get(f.meterId);
    if (!basis || !meter || f.severity === "info" || !f.corrections?.length || f.amountAtStake === null) continue;
    const claim = claimOf(f.corrections);
    if (claim === 0) continue;
    const billIds = f.corrections.map((c) => c.billId).filter((id): id is string => id !== null);
    const periodStart = f.corrections.reduce((m, c) => (c.periodStart < m ? c.periodStart : m), f.corrections[0].periodStart);
    const periodEnd = f.corrections.reduce((m, c) => (c.periodEnd > m ? c.periodEnd : m), f.corrections[0].periodEnd);
    const billed = round2(f.corrections.reduce((s, c) => s + c.billedTotal, 0));
    const range = f.corrections.length === 1 && f.corrections[0].range ? f.corrections[0].range : null;
    candidates.push({
      disputeId: `D-${hash32([f.buildingId, f.meterId, basis, periodStart, periodEnd, ...billIds].join("|"))}`,
      buildingId: f.buildingId,
      meterId: f.meterId,
      account: meter.account,
      billIds,
      periodStart,
      periodEnd,
      checks: [f.check, ...(f.absorbedChecks ?? []).filter((c) => c !== f.check)],
      basis,
      kind: claim > 0 ? "claim" : "back-bill-risk",
      severity: f.severity,
      billedTotal: billed,
      correctedTotal: round2(billed - claim),
      claimAmount: claim,
      correctedRange: range,
      title: f.title,
      explanation: f.message,
      bills: f.corrections.map((c) =>
        disputeBill(c, c.billId ? bills.get(c.billId) : undefined, meter, c.billId ? (lines.get(c.billId) ?? []) : [], c.billId ? input.metered?.get(c.billId) : undefined),
      ),
      relatedBillIds: (f.relatedBillIds ?? []).filter((id) => !billIds.includes(id)),
      notes: [...f.evidence.notes],
    });
  }

  // A bill is claimed once: the larger dispute keeps it, the smaller becomes a note on it.
  candidates.sort((a, b) => Math.abs(b.claimAmount) - Math.abs(a.claimAmount) || a.disputeId.localeCompare(b.disputeId));
  const kept: Dispute[] = [];
  const owner = new Map<string, Dispute>();
  for (const d of candidates) {
    const clash = d.billIds.map((id) => owner.get(id)).find((x) => x !== undefined);
    if (clash) {
      clash.notes.push(`Also on ${d.billIds.join(", ")}: ${d.title} (${d.checks.join(", ")}), ${moneyText(d.claimAmount)} by itself; not claimed separately so the bill is not claimed twice.`);
      for (const c of d.checks) if (!clash.checks.includes(c)) clash.checks.push(c);
      continue;
    }
    kept.push(d);
    for (const id of d.billIds) owner.set(id, d);
  }
  const rank = (d: Dispute): number => (d.kind === "claim" ? 0 : 1);
  return kept.sort(
    (a, b) =>
      rank(a) - rank(b) ||
      Math.abs(b.claimAmount) - Math.abs(a.claimAmount) ||
      a.buildingId.localeCompare(b.buildingId) ||
      a.meterId.localeCompare(b.meterId) ||
      a.periodStart.localeCompare(b.periodStart),
  );
}
