/**
 * Only problems ohmbook raises on purpose (OhmbookError) may become "building X could not be
 * analysed"; a bug (here a TypeError from a corrupted bill) must fail the build, or, when the
 * CLI asks for it, be reported as a bug while the other buildings still get their pages.
 */
import { describe, expect, it } from "vitest";
import { loadTariff } from "../../src/tariff/load.ts";
import type { Tariff } from "../../src/tariff/model.ts";
import { analyseBuilding } from "../../src/pipeline/build.ts";
import { OhmbookError, expectedProblem, bugReportLine } from "../../src/core/errors.ts";
import type { Bill, Portfolio } from "../../src/domain/types.ts";
import { bill as makeBill, portfolio as makePortfolio, meter } from "../audit/fixtures.ts";

const TARIFF = loadTariff(`
id: T-E
commodity: electricity
usage_unit: kWh
versions:
  - from: 2023-01-01
    charges:
      - { label: Customer charge, fixed: 20.00 }
      - { label: Energy, energy: 0.10 }
`, "T-E.yaml").tariff!;

function portfolioWith(bills: Bill[]): Portfolio<Tariff> {
  const p = makePortfolio({ bills, meters: [meter({ tariffId: "T-E" })] });
  return { ...p, tariffs: new Map([["T-E", TARIFF]]) } as Portfolio<Tariff>;
}

/** A bill whose usage cannot be read: any stage touching it throws a TypeError, as a bug would. */
function corruptedBill(): Bill {
  const b = makeBill("2024-01-01", "2024-02-01", { billId: "B1", meterId: "E1", usage: 1000, total: 120 });
  Object.defineProperty(b, "usage", { get: () => { throw new TypeError("corrupted usage"); } });
  return b;
}

describe("per-building error boundary", () => {
  it("a healthy building is analysed with no failure", () => {
    const p = portfolioWith([makeBill("2024-01-01", "2024-02-01", { billId: "B1", meterId: "E1", usage: 1000, total: 120 })]);
    expect(analyseBuilding(p, p.buildings[0]!).failure).toBeNull();
  });
  it("a bug fails loudly by default (tests, --strict)", () => {
    const p = portfolioWith([corruptedBill()]);
    expect(() => analyseBuilding(p, p.buildings[0]!)).toThrow(TypeError);
  });
  it("with a reporting policy the bug becomes the building's failure, marked as a bug", () => {
    const p = portfolioWith([corruptedBill()]);
    const seen: unknown[] = [];
    const r = analyseBuilding(p, p.buildings[0]!, new Map(), (e) => {
      seen.push(e);
      return `internal error: ${(e as Error).message}`;
    });
    expect(r.failure).toBe("internal error: corrupted usage");
    expect(seen[0]).toBeInstanceOf(TypeError);
  });
  it("expectedProblem passes OhmbookError messages and rethrows anything else", () => {
    expect(expectedProblem(new OhmbookError("no model"))).toBe("no model");
    expect(() => expectedProblem(new TypeError("x is undefined"))).toThrow(TypeError);
    expect(bugReportLine("analysing building B", new TypeError("x is undefined"))).toMatch(/^internal error while analysing building B: TypeError: x is undefined .*a bug in ohmbook/);
  });
});
