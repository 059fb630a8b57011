/**
 * The demo's planted billing problems (listed by its seeded generator, documented in
 * data/demo/README.md) are all found by the full pipeline, and nothing else reaches warning.
 * Source of the expectations: the generator's own record of what it changed.
 */
import { describe, expect, it } from "vitest";
import { loadPortfolio } from "../../src/ingest/index.ts";
import { analyseBuilding } from "../../src/pipeline/build.ts";
import { generateDemo } from "../../scripts/demo/generate.ts";
import type { Finding } from "../../src/audit/types.ts";
import { buildDisputes } from "../../src/disputes/index.ts";

describe("demo portfolio audit", async () => {
  const loaded = await loadPortfolio("data/demo");
  const portfolio = loaded.portfolio!;
  const results = portfolio.buildings.map((b) => analyseBuilding(portfolio as never, b));
  const findings: Finding[] = results.flatMap((r) => r.findings);
  const { problems } = generateDemo();
  const serious = findings.filter((f) => f.severity !== "info");

  it("loads without errors", () => {
    expect(loaded.fatal).toBe(false);
    expect(loaded.issues.filter((i) => i.severity === "error")).toEqual([]);
  });

  const matches = (f: Finding, p: (typeof problems)[number]) =>
    f.meterId === p.meterId &&
    p.checks.includes(f.check) &&
    [f.billId, ...(f.relatedBillIds ?? [])].some((id) => id !== null && (p.billIds.includes(id) || p.checks.includes("period-gap")));

  for (const problem of problems) {
    it(`finds ${problem.checks[0]} on ${problem.billIds.join(", ")}`, () => {
      const hit = serious.find((f) => matches(f, problem));
      expect(hit, JSON.stringify(serious.map((f) => [f.check, f.billId]))).toBeDefined();
      // Money problems: the amount at stake agrees with the generator's within 1 % (the issue's
      // acceptance tolerance), except the overlap: the audit estimates the overlapped days' use
      // at the earlier bill's use per day, while the generator knows the true days (within 5 %).
      if (problem.amountAtStakeUsd !== null && hit!.amountAtStake !== null) {
        const tolerance = hit!.check === "period-overlap" ? 0.05 : 0.01;
        expect(Math.abs(hit!.amountAtStake - problem.amountAtStakeUsd)).toBeLessThanOrEqual(Math.abs(problem.amountAtStakeUsd) * tolerance);
      }
    });
  }

  describe("dispute list", () => {
    const disputes = buildDisputes({ findings, bills: portfolio.bills, meters: portfolio.meters, billLines: portfolio.billLines });
    const money = problems.filter((p) => p.amountAtStakeUsd !== null || p.checks.includes("period-gap"));
    for (const problem of money) {
      it(`${problem.checks[0]} on ${problem.billIds.join(", ")} is one dispute with the planted amount`, () => {
        const mine = disputes.filter((d) => d.meterId === problem.meterId &&
          (d.billIds.some((id) => problem.billIds.includes(id)) || (d.basis === "gap" && problem.checks.includes("period-gap"))));
        expect(mine, JSON.stringify(disputes.map((d) => [d.basis, d.billIds, d.claimAmount]))).toHaveLength(1);
        const d = mine[0];
        if (problem.amountAtStakeUsd !== null) {
          expect(d.kind).toBe("claim");
          const tolerance = d.basis === "overlap" ? 0.05 : 0.01;
          expect(Math.abs(d.claimAmount - problem.amountAtStakeUsd)).toBeLessThanOrEqual(problem.amountAtStakeUsd * tolerance);
        } else {
          // the missing bill: the generator's note gives what it would have been
          const wouldHaveBeen = Number(/would have been ([\d.]+)/.exec(problem.note ?? "")![1]);
          expect(d).toMatchObject({ kind: "back-bill-risk", basis: "gap", billedTotal: 0 });
          expect(d.correctedRange!.low).toBeLessThanOrEqual(wouldHaveBeen);
          expect(d.correctedRange!.high).toBeGreaterThanOrEqual(wouldHaveBeen);
          expect(Math.abs(d.correctedTotal - wouldHaveBeen)).toBeLessThanOrEqual(wouldHaveBeen * 0.05);
        }
      });
    }
    it("every dispute's claim equals its finding's amount to the cent, and no bill is claimed twice", () => {
      for (const d of disputes) {
        const f = findings.find((x) => x.check === d.checks[0] && x.meterId === d.meterId && (x.corrections ?? []).some((c) => c.billId === (d.billIds[0] ?? null)));
        expect(f, d.disputeId).toBeDefined();
        expect(d.claimAmount).toBe(f!.amountAtStake);
        expect(d.claimAmount).toBe(Math.round((d.billedTotal - d.correctedTotal) * 100) / 100);
      }
      const ids = disputes.flatMap((d) => d.billIds);
      expect(new Set(ids).size).toBe(ids.length);
    });
    it("nothing that is not money becomes a dispute (estimated reads, the leak)", () => {
      expect(disputes.filter((d) => d.checks[0] === "estimated-read" || d.checks[0] === "usage-outlier")).toEqual([]);
      expect(disputes.every((d) => /^D-[0-9a-f]{8}$/.test(d.disputeId))).toBe(true);
    });
  });

  it("raises nothing else at warning or error", () => {
    const unexplained = serious.filter((f) => !problems.some((p) => matches(f, p)));
    expect(unexplained.map((f) => `${f.check} ${f.billId}`)).toEqual([]);
  });

  it("every bill of every building re-prices, and no building fails", () => {
    expect(results.map((r) => r.failure)).toEqual(results.map(() => null));
    const unpriced = results.flatMap((r) => [...r.priced].filter(([, p]) => p.computed === null).map(([id, p]) => `${id}: ${p.error}`));
    expect(unpriced).toEqual([]);
    expect(results.reduce((n, r) => n + r.priced.size, 0)).toBe(portfolio.bills.length);
  });
});
