// Property tests (fast-check, invented random data): the audit never throws, every finding is
// well-formed, the ranking holds, and the output rows match the findings one for one.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CHECK_CODES, findingsToCsvRows, runAudit, SEVERITY_RANK } from "../../src/audit/index.ts";
import type { Bill } from "../../src/domain/types.ts";
import type { ComputedBill } from "../../src/tariff/types.ts";
import { bill, computed, input, metered, portfolio, printed } from "./fixtures.ts";
import { addDays } from "../../src/core/time/index.ts";

const billArb = fc.record({
  offsetDays: fc.integer({ min: 0, max: 800 }),
  days: fc.integer({ min: 1, max: 40 }),
  usage: fc.double({ min: 0, max: 1e6, noNaN: true }),
  total: fc.double({ min: -1000, max: 1e5, noNaN: true }),
  estimated: fc.boolean(),
  demandKw: fc.option(fc.double({ min: 0, max: 5000, noNaN: true })),
  computedTotal: fc.option(fc.double({ min: 0, max: 1e5, noNaN: true })),
  exact: fc.boolean(),
  meteredUsage: fc.option(fc.double({ min: 0, max: 1e6, noNaN: true })),
  coverage: fc.double({ min: 0, max: 1, noNaN: true }),
  line: fc.option(fc.double({ min: -100, max: 1e4, noNaN: true })),
});

describe("runAudit on random bills", () => {
  it("never throws and returns well-formed, ranked findings", () => {
    fc.assert(
      fc.property(fc.array(billArb, { maxLength: 30 }), (specs) => {
        const bills: Bill[] = specs.map((s, i) => {
          const start = addDays("2023-01-01", s.offsetDays);
          return bill(start, addDays(start, s.days), {
            billId: `B${i}`, usage: s.usage, total: s.total, demandKw: s.demandKw,
            readType: s.estimated ? "estimated" : "actual",
          });
        });
        const priced = new Map<string, ComputedBill | null>(specs.map((s, i) => [`B${i}`,
          s.computedTotal === null ? null : computed([["Energy", s.computedTotal, s.exact ? "exact" : "estimated"]])]));
        const meteredMap = new Map(specs.map((s, i) => [`B${i}`, s.meteredUsage === null ? null :
          metered(s.meteredUsage, { coverage: s.coverage, intervals: Math.round(s.coverage * 2880), peakKw: s.meteredUsage / 100 })]));
        const lines = specs.flatMap((s, i) => (s.line === null ? [] : [printed(`B${i}`, i % 2 ? "Energy" : "Late fee", s.line)]));
        const f = runAudit(input(portfolio({ bills, billLines: lines }), { priced, metered: meteredMap }));
        for (const x of f) {
          expect(CHECK_CODES).toContain(x.check);
          expect(x.message.length).toBeGreaterThan(10);
          expect(x.amountAtStake === null || Number.isFinite(x.amountAtStake)).toBe(true);
        }
        for (let i = 1; i < f.length; i++) {
          const a = Math.abs(f[i - 1].amountAtStake ?? 0);
          const b = Math.abs(f[i].amountAtStake ?? 0);
          expect(a > b || (a === b && SEVERITY_RANK[f[i - 1].severity] >= SEVERITY_RANK[f[i].severity])).toBe(true);
        }
        expect(findingsToCsvRows(f)).toHaveLength(f.length);
      }),
      { numRuns: 300, seed: 20261201 },
    );
  });
});
