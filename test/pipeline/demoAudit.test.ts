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
      // acceptance tolerance), except the overlap, whose amount the audit prorates by days
      // (documented in data/demo/README.md).
      if (problem.amountAtStakeUsd !== null && hit!.amountAtStake !== null && hit!.check !== "period-overlap") {
        expect(Math.abs(hit!.amountAtStake - problem.amountAtStakeUsd)).toBeLessThanOrEqual(Math.abs(problem.amountAtStakeUsd) * 0.01);
      }
    });
  }

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
