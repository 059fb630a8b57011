/**
 * Cascade suppression: one cause, one finding. A root-cause finding keeps its money; the
 * findings it explains are removed and summarised in its evidence notes.
 *
 * Rules, applied in this order (a finding already absorbed cannot absorb others):
 *  1. duplicate-bill absorbs every other finding on the duplicate bill itself;
 *  2. multiplier-suspect absorbs usage-vs-meter, demand-vs-meter, total-mismatch, line-mismatch,
 *     rate-suspect and usage-outlier on the bills it covers;
 *  3. usage-vs-meter (warning or error) absorbs demand-vs-meter on its bill (its corrected bill is
 *     already priced on the meter's usage and demand); then usage-vs-meter and demand-vs-meter
 *     absorb total-mismatch, line-mismatch and rate-suspect on their bill: billed quantities that
 *     differ from the meter can also show up as money differences. The root keeps its own money
 *     (billed − re-priced on metered quantities), or takes the total's difference (and corrected
 *     bill) when it has none;
 *  4. rate-suspect absorbs total-mismatch, line-mismatch and unexplained-line on its bill;
 *  5. estimated-read absorbs usage-vs-meter, demand-vs-meter and usage-outlier on the bills it
 *     covers (an estimate or its true-up explains usage that differs from the meter), without
 *     taking their severity: estimates and true-ups differ from the meter by design;
 *  6. usage-vs-meter absorbs usage-outlier on its bill (the billed usage itself is wrong);
 *  7. missing-bill absorbs a period-gap over the same days (interval data proves use);
 *  8. period-overlap absorbs a period-gap next to one of its bills (shifted dates cause both);
 *  9. line-mismatch + unexplained-line findings of a bill absorb its total-mismatch when their
 *     amounts add up to the total difference within the money tolerance: they are one cause (e.g.
 *     a wrong rate and the tax on it), so the largest line finding absorbs the others and the
 *     total, and takes the total's difference and corrected bill (one claim per bill).
 * Unless said otherwise a root that absorbs a more severe finding takes that severity, and the
 * absorbed finding's message is kept in the root's evidence notes.
 */
import { exceedsMoneyTolerance } from "./tolerances.ts";
import { SEVERITY_RANK, type AuditTolerances, type CheckCode, type Finding } from "./types.ts";

type Scope = "own" | "covered" | "same-days" | "neighbour";

interface Rule {
  root: CheckCode;
  victims: CheckCode[] | "all";
  scope: Scope;
  /** Take the victim's severity when higher (default true). */
  escalate?: boolean;
  /** An info root (e.g. "too little data to compare") absorbs nothing. */
  skipInfoRoot?: boolean;
  /** A root without money takes a total-mismatch victim's amount. */
  takeAmount?: boolean;
}

const METER_VICTIMS: CheckCode[] = ["total-mismatch", "line-mismatch", "rate-suspect"];

const RULES: Rule[] = [
  { root: "duplicate-bill", victims: "all", scope: "own" },
  { root: "multiplier-suspect", victims: ["usage-vs-meter", "demand-vs-meter", "total-mismatch", "line-mismatch", "rate-suspect", "usage-outlier"], scope: "covered" },
  { root: "usage-vs-meter", victims: ["demand-vs-meter"], scope: "own", skipInfoRoot: true },
  { root: "usage-vs-meter", victims: METER_VICTIMS, scope: "own", skipInfoRoot: true, takeAmount: true },
  { root: "demand-vs-meter", victims: METER_VICTIMS, scope: "own", skipInfoRoot: true, takeAmount: true },
  { root: "rate-suspect", victims: ["total-mismatch", "line-mismatch", "unexplained-line"], scope: "own" },
  { root: "estimated-read", victims: ["usage-vs-meter", "demand-vs-meter", "usage-outlier"], scope: "covered", escalate: false },
  { root: "usage-vs-meter", victims: ["usage-outlier"], scope: "own" },
  { root: "missing-bill", victims: ["period-gap"], scope: "same-days" },
  { root: "period-overlap", victims: ["period-gap"], scope: "neighbour" },
];

function covered(f: Finding): Set<string> {
  const s = new Set(f.relatedBillIds ?? []);
  if (f.billId !== null) s.add(f.billId);
  return s;
}

function applies(root: Finding, victim: Finding, scope: Scope): boolean {
  if (root.meterId !== victim.meterId || root === victim) return false;
  switch (scope) {
    case "own":
      return root.billId !== null && victim.billId === root.billId;
    case "covered":
      return victim.billId !== null && covered(root).has(victim.billId);
    case "same-days":
      return root.periodStart !== null && root.periodEnd !== null && victim.periodStart !== null && victim.periodEnd !== null &&
        root.periodStart < victim.periodEnd && victim.periodStart < root.periodEnd;
    case "neighbour": {
      const rootBills = covered(root);
      return (victim.relatedBillIds ?? []).some((id) => rootBills.has(id));
    }
  }
}

function note(victim: Finding): string {
  return `Also explains ${victim.check}${victim.billId && victim.billId !== null ? ` on ${victim.billId}` : ""}: ${victim.message}`;
}

/**
 * Removes findings explained by a root cause (rules above) and records them on the root.
 * Pure: returns new finding objects for roots; the input array is not mutated.
 */
export function dedupeFindings(findings: Finding[], tol: Pick<AuditTolerances, "costAbs" | "costPct">): Finding[] {
  const live = findings.map((f) => ({ ...f, evidence: { rows: [...f.evidence.rows], notes: [...f.evidence.notes] } }));
  const absorbed = new Set<Finding>();
  const absorb = (root: Finding, victim: Finding, escalate = true): void => {
    absorbed.add(victim);
    root.absorbedChecks = [...new Set([...(root.absorbedChecks ?? []), victim.check, ...(victim.absorbedChecks ?? [])])];
    root.evidence.notes.push(note(victim), ...victim.evidence.notes.filter((n) => n.startsWith("Also explains")));
    if (escalate && SEVERITY_RANK[victim.severity] > SEVERITY_RANK[root.severity]) root.severity = victim.severity;
  };

  // every rule relates findings of one meter only: index by meter so large portfolios stay linear-ish
  const byMeter = new Map<string, Finding[]>();
  for (const f of live) {
    const list = byMeter.get(f.meterId);
    if (list) list.push(f);
    else byMeter.set(f.meterId, [f]);
  }

  for (const rule of RULES) {
    for (const root of live) {
      if (root.check !== rule.root || absorbed.has(root)) continue;
      if (rule.skipInfoRoot && root.severity === "info") continue;
      for (const victim of byMeter.get(root.meterId) ?? []) {
        if (absorbed.has(victim) || victim === root) continue;
        if (rule.victims !== "all" && !rule.victims.includes(victim.check)) continue;
        if (!applies(root, victim, rule.scope)) continue;
        if (rule.takeAmount && root.amountAtStake === null && victim.check === "total-mismatch") {
          root.amountAtStake = victim.amountAtStake;
          root.corrections = victim.corrections;
        }
        absorb(root, victim, rule.escalate ?? true);
      }
    }
  }

  // rule 9: printed-line findings that add up to the total difference explain it
  for (const total of live) {
    if (total.check !== "total-mismatch" || absorbed.has(total) || total.amountAtStake === null) continue;
    const lines = (byMeter.get(total.meterId) ?? []).filter((f) => !absorbed.has(f) && f.billId === total.billId &&
      (f.check === "line-mismatch" || f.check === "unexplained-line") && f.amountAtStake !== null);
    if (lines.length === 0) continue;
    const sum = lines.reduce((s, f) => s + (f.amountAtStake ?? 0), 0);
    if (exceedsMoneyTolerance(total.amountAtStake - sum, total.amountAtStake, tol)) continue;
    const biggest = lines.reduce((a, b) => (Math.abs(b.amountAtStake ?? 0) > Math.abs(a.amountAtStake ?? 0) ? b : a));
    for (const other of lines) if (other !== biggest) absorb(biggest, other);
    absorb(biggest, total);
    biggest.amountAtStake = total.amountAtStake;
    biggest.corrections = total.corrections;
  }

  return live.filter((f) => !absorbed.has(f));
}
