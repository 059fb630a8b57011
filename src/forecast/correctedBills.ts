/**
 * Bills as they should have been: the audit's corrected bills (Finding.corrections, the same
 * figures the dispute list claims) applied to the billed record, so "last year" and the
 * backtests rest on what the tariff says the use should have cost, not on billing errors.
 *
 * Rules, per money finding (amount at stake not null, severity above info):
 *  - a corrected bill with a bill id replaces that bill's total (and usage, when the correction
 *    was priced on a different usage); a corrected total of 0 with no pricing (a duplicate) removes
 *    the bill;
 *  - a corrected bill without a bill id (a period no bill covered) is added as a bill;
 *  - when several findings correct the same bill, the one that changes it most is used (findings
 *    about one bill are alternative views of one error, and the audit removes cascades).
 */
import type { Bill } from "../domain/types.ts";
import type { CorrectedBill } from "../audit/index.ts";

/** The slice of an audit finding this module reads. */
export interface MoneyFindingLike {
  severity: string;
  amountAtStake: number | null;
  corrections?: readonly CorrectedBill[];
}

export interface CorrectedBillSet {
  /** Every bill, with corrections applied (removed duplicates left out, unbilled periods added). */
  bills: Bill[];
  /** billed − corrected by bill id (positive = the bill was too high); gaps under `gap:<meter>:<start>`. */
  deltaByBill: Map<string, { meterId: string; periodStart: string; periodEnd: string; billed: number; corrected: number }>;
}

/**
 * Applies the audit's corrections to `bills` (see the module comment). Pure: inputs are not changed.
 * @param meterOf meter id of a finding's gap correction (corrections without a bill id carry no meter)
 * @example correctBills(bills, [{ severity: "warning", amountAtStake: 12, corrections: [{ billId: "B1", correctedTotal: 88, … }] }], …).bills // B1 at 88
 */
export function correctBills(bills: readonly Bill[], findings: readonly (MoneyFindingLike & { meterId: string })[]): CorrectedBillSet {
  const byId = new Map(bills.map((b) => [b.billId, b]));
  const best = new Map<string, { c: CorrectedBill; meterId: string }>();
  for (const f of findings) {
    if (f.amountAtStake === null || f.severity === "info" || !f.corrections) continue;
    for (const c of f.corrections) {
      const key = c.billId ?? `gap:${f.meterId}:${c.periodStart}`;
      if (c.billId !== null && !byId.has(c.billId)) continue;
      const prior = best.get(key);
      if (!prior || Math.abs(c.billedTotal - c.correctedTotal) > Math.abs(prior.c.billedTotal - prior.c.correctedTotal)) best.set(key, { c, meterId: f.meterId });
    }
  }
  const deltaByBill: CorrectedBillSet["deltaByBill"] = new Map();
  const out: Bill[] = [];
  for (const b of bills) {
    const hit = best.get(b.billId);
    if (!hit) {
      out.push(b);
      continue;
    }
    const { c } = hit;
    deltaByBill.set(b.billId, { meterId: b.meterId, periodStart: b.periodStart, periodEnd: b.periodEnd, billed: c.billedTotal, corrected: c.correctedTotal });
    if (c.correctedTotal === 0 && c.corrected === null) continue; // a bill that should not exist
    out.push({ ...b, total: c.correctedTotal, usage: c.usage ?? b.usage, demandKw: c.demandKw ?? b.demandKw });
  }
  for (const [key, { c, meterId }] of best) {
    if (c.billId !== null) continue;
    deltaByBill.set(key, { meterId, periodStart: c.periodStart, periodEnd: c.periodEnd, billed: c.billedTotal, corrected: c.correctedTotal });
    out.push({
      billId: key, meterId, periodStart: c.periodStart, periodEnd: c.periodEnd, usage: c.usage ?? 0, readType: "estimated",
      demandKw: c.demandKw, powerFactor: null, total: c.correctedTotal, statementDate: null, source: { file: "audit correction", line: 0 },
    });
  }
  return { bills: out, deltaByBill };
}
