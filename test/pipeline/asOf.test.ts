// Issue 16, item 8: as_of is "the last day of data used" (inputs.md): nothing after it is
// audited, modelled or forecast from, and the user is told what was left out.
import { describe, expect, it } from "vitest";
import { cutAtAsOf } from "../../src/pipeline/asOf.ts";
import { bill, portfolio, series } from "../audit/fixtures.ts";

describe("cutAtAsOf", () => {
  const bills = [bill("2024-01-01", "2024-02-01"), bill("2024-02-01", "2024-03-01"), bill("2024-03-01", "2024-04-01")];
  const data = series("2024-01-01", "2024-04-01", () => 1, 60);
  const base = portfolio({ bills, intervals: [data], asOf: "2024-02-29" });

  it("keeps bills whose last day is on or before as_of, leaves out later ones with one warning per meter", () => {
    const { portfolio: p, issues } = cutAtAsOf(base);
    expect(p.bills.map((b) => b.periodStart)).toEqual(["2024-01-01", "2024-02-01"]);
    const billWarning = issues.find((i) => /bill\(s\) of meter E1/.test(i.message))!;
    expect(billWarning).toMatchObject({ severity: "warning", file: "bills.csv", line: bills[2].source.line });
    expect(billWarning.message).toContain("1 bill(s)");
  });

  it("cuts interval data at the end of the as_of day in the building's zone (New York: 2024-03-01 05:00 UTC)", () => {
    const { portfolio: p, issues } = cutAtAsOf(base);
    const s = p.intervals.get("E1")!;
    expect(s.startMs.at(-1)).toBe(Date.parse("2024-03-01T04:00:00Z")); // last hour of Feb 29, local
    expect(issues.some((i) => /interval reading\(s\) of meter E1/.test(i.message))).toBe(true);
  });

  it("changes nothing without as_of", () => {
    const open = portfolio({ bills, intervals: [data], asOf: null });
    const { portfolio: p, issues } = cutAtAsOf(open);
    expect(p).toBe(open);
    expect(issues).toEqual([]);
  });
});
