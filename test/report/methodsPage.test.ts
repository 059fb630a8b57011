/** Methods page model: every audit check code explained, with this portfolio's tolerances. */
import { describe, expect, it } from "vitest";
import { buildMethodsPage, checkExplanations } from "../../src/report/methodsPage.ts";
import { CHECK_CODES } from "../../src/audit/types.ts";
import { AUDIT_DEFAULTS } from "../../src/audit/tolerances.ts";

const tol = { usagePct: 2, demandPct: 3, costAbs: 1, costPct: 0.5 };

describe("methods page", () => {
  it("explains every check code of the outputs contract once, in contract order", () => {
    expect(checkExplanations(tol, "USD").map((c) => c.code)).toEqual([...CHECK_CODES]);
    const page = buildMethodsPage("USD", "the 12 months up to each meter's last read", tol);
    // Grouped by what to do (claim, ask, note): every code in exactly one group, each with its words.
    const checks = page.checkGroups.flatMap((g) => g.checks);
    expect(checks.map((c) => c.code).sort()).toEqual([...CHECK_CODES].sort());
    expect(page.checkGroups.map((g) => g.heading)).toEqual(["Money to raise with the utility", "Questions to ask before paying", "Worth knowing, nothing to claim"]);
    for (const c of checks) for (const text of [c.title, c.looksFor, c.rule, c.severity, c.amount, c.source]) expect(text.length, c.code).toBeGreaterThan(3);
    // Every check with money of its own is in the claim group; the note group carries none.
    const note = page.checkGroups[2].checks;
    for (const c of note) expect(c.amount, c.code).toMatch(/^None/);
  });

  it("states the portfolio's money rule (BOTH limits) and tolerances in the rules", () => {
    const byCode = new Map(checkExplanations({ usagePct: 2.5, demandPct: 4, costAbs: 5, costPct: 1 }, "USD").map((c) => [c.code, c]));
    expect(byCode.get("total-mismatch")!.rule).toContain("more than BOTH $5.00 and 1 %");
    expect(byCode.get("usage-vs-meter")!.rule).toContain("> 2.5 %");
    expect(byCode.get("usage-vs-meter")!.rule).toContain(`at least ${AUDIT_DEFAULTS.minCoverage * 100} %`);
    expect(byCode.get("demand-vs-meter")!.rule).toContain("> 4 %");
    expect(byCode.get("estimated-read")!.rule).toContain(`run of ${AUDIT_DEFAULTS.estimateStreakMin} or more`);
    // Interim outlier rule: × 2, and 2^1.5 = 2.83 on seasonal meters (hand-computed).
    expect(byCode.get("usage-outlier")!.rule).toContain("× 2.83");
    expect(byCode.get("period-overlap")!.amount).toContain("overlap days ÷ billing days");
  });

  it("lists the tolerances and the 12-month window text", () => {
    const page = buildMethodsPage("EUR", "the 12 months up to each meter's last read, ending no later than Dec 31, 2025", tol);
    expect(page.tolerances[0].value).toBe("a difference counts when it exceeds both €1.00 and 0.5 % of the expected amount");
    expect(page.windowText).toContain("each meter's last read");
  });
});
