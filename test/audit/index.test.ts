// runAudit end to end on small fixtures: cascade suppression, ranking, output rows.
import { describe, expect, it } from "vitest";
import { findingsToCsvRows, findingsToCsvText, reachesSeverity, runAudit, toFindingsJson, FINDINGS_CSV_COLUMNS, CHECK_CODES } from "../../src/audit/index.ts";
import type { Finding, RepriceFn } from "../../src/audit/types.ts";
import { bill, computed, input, metered, portfolio, printed, series, year } from "./fixtures.ts";

const reprice: RepriceFn = (_b, alt) => (alt.kind === "quantities" ? computed([["Energy", alt.usage * 0.15]]) : null);

describe("cascade suppression", () => {
  it("a multiplier error keeps the money and absorbs usage-vs-meter and total-mismatch on the same bills", () => {
    const bills = year(Array(12).fill(1000), (i) => ({ total: i === 5 ? 300 : 150, usage: i === 5 ? 2000 : 1000 }));
    // own pricing of the (wrong) billed usage deliberately off too, so total-mismatch would fire
    const priced = new Map(bills.map((b) => [b.billId, computed([["Energy", b.usage === 2000 ? 290 : 150]])]));
    const f = runAudit(input(portfolio({ bills }), { priced, metered: new Map(bills.map((b) => [b.billId, metered(1000)])), reprice }));
    expect(f.map((x) => x.check)).toEqual(["multiplier-suspect"]);
    expect(f[0].amountAtStake).toBe(150); // 300 − 1,000 × 0.15
    expect(f[0].evidence.notes.some((n) => n.startsWith("Also explains usage-vs-meter"))).toBe(true);
    expect(f[0].evidence.notes.some((n) => n.startsWith("Also explains total-mismatch"))).toBe(true);
  });
  it("a duplicate bill raises duplicate-bill only (no overlap, and its own total-mismatch is absorbed)", () => {
    const a = bill("2024-02-01", "2024-03-01", { total: 170 });
    const dup = bill("2024-02-01", "2024-03-01", { total: 170, billId: "dup" });
    const bills = [bill("2024-01-01", "2024-02-01"), a, dup, bill("2024-03-01", "2024-04-01")];
    const priced = new Map(bills.map((b) => [b.billId, computed([["Energy", 150]])]));
    const f = runAudit(input(portfolio({ bills }), { priced }));
    expect(f.map((x) => `${x.check}:${x.billId}`).sort()).toEqual(["duplicate-bill:dup", "total-mismatch:E1:2024-02-01"]);
  });
  it("a shifted bill raises period-overlap but not also a period-gap", () => {
    const bills = [bill("2024-01-01", "2024-02-01"), bill("2024-01-25", "2024-02-25", { total: 155 }), bill("2024-03-01", "2024-04-01")];
    const f = runAudit(input(portfolio({ bills }))).filter((x) => x.severity !== "info"); // info: bills not priced here
    expect(f.map((x) => x.check)).toEqual(["period-overlap"]);
    expect(f[0].evidence.notes.some((n) => n.startsWith("Also explains period-gap"))).toBe(true);
  });
  it("line-mismatches that add up to the total difference replace the total-mismatch", () => {
    const b = bill("2024-01-01", "2024-02-01", { total: 162.4 });
    const lines = [printed(b.billId, "Customer charge", 24.5), printed(b.billId, "Energy", 132.4), printed(b.billId, "Sales tax", 5.5)];
    const c = computed([["Customer charge", 24.5], ["Energy", 120], ["Sales tax", 5.5]]);
    const f = runAudit(input(portfolio({ bills: [b], billLines: lines }), { priced: new Map([[b.billId, c]]) }));
    expect(f.map((x) => [x.check, x.amountAtStake])).toEqual([["line-mismatch", 12.4]]);
  });
  it("...but a total difference the lines do not explain stays", () => {
    const b = bill("2024-01-01", "2024-02-01", { total: 182.4 }); // 20.00 more than the printed lines add to
    const lines = [printed(b.billId, "Customer charge", 24.5), printed(b.billId, "Energy", 132.4), printed(b.billId, "Sales tax", 5.5)];
    const c = computed([["Customer charge", 24.5], ["Energy", 120], ["Sales tax", 5.5]]);
    const f = runAudit(input(portfolio({ bills: [b], billLines: lines }), { priced: new Map([[b.billId, c]]) }));
    expect(f.map((x) => [x.check, x.amountAtStake])).toEqual([["total-mismatch", 32.4], ["line-mismatch", 12.4]]);
  });
  it("a demand-vs-meter explains the total-mismatch and a coincidental rate-suspect; without reprice it takes the total's amount", () => {
    const b = bill("2024-01-01", "2024-02-01", { total: 2200, demandKw: 120 });
    // the engine priced demand from the interval peak (100 kW): computed 2,000.00
    const rp: RepriceFn = (_b, alt) => (alt.kind === "rate" ? computed([["Demand", 2195]]) : null);
    const f = runAudit(input(portfolio({ bills: [b], tariffs: ["T1", "T-OLD"] }), {
      priced: new Map([[b.billId, computed([["Demand", 2000]])]]),
      metered: new Map([[b.billId, metered(1000, { peakKw: 100 })]]),
      reprice: rp,
    }));
    expect(f.map((x) => [x.check, x.severity, x.amountAtStake])).toEqual([["demand-vs-meter", "error", 200]]);
    expect(f[0].evidence.notes.filter((n) => n.startsWith("Also explains")).map((n) => n.split(" ")[2])).toEqual(["total-mismatch", "rate-suspect"]);
  });
  it("an estimate absorbs its usage-vs-meter without taking its severity", () => {
    const bills = year(Array(12).fill(1000), (i) => (i === 4 ? { readType: "estimated", usage: 1300 } : i === 5 ? { usage: 700 } : {}));
    const f = runAudit(input(portfolio({ bills }), {
      priced: new Map(bills.map((b) => [b.billId, computed([["Energy", 150]])])),
      metered: new Map(bills.map((b) => [b.billId, metered(1000)])),
    }));
    expect(f.map((x) => [x.check, x.severity, x.billId])).toEqual([
      ["estimated-read", "info", "E1:2024-05-01"],
      ["estimated-read", "info", "E1:2024-06-01"],
    ]);
  });
  it("a rate-suspect absorbs the total-mismatch of its bill", () => {
    const b = bill("2024-01-01", "2024-02-01", { total: 171.2 });
    const rp: RepriceFn = (_b, alt) => (alt.kind === "rate" ? computed([["Energy", 171.2]]) : null);
    const f = runAudit(input(portfolio({ bills: [b], tariffs: ["T1", "T-OLD"] }), { priced: new Map([[b.billId, computed([["Energy", 150]])]]), reprice: rp }));
    expect(f.map((x) => [x.check, x.amountAtStake])).toEqual([["rate-suspect", 21.2]]);
  });
  it("usage-vs-meter absorbs the usage-outlier on the same bill", () => {
    const bills = year(Array(12).fill(1000), (i) => (i === 6 ? { usage: 3500 } : {}));
    const y0 = year(Array(12).fill(1000)).map((b) => ({ ...b, billId: b.billId.replace("2024", "2023"), periodStart: b.periodStart.replace("2024", "2023"), periodEnd: b.periodEnd.replace("2025", "2024").replace(/^2024-(0[2-9]|1[0-2])/, "2023-$1") }));
    const all = [...y0, ...bills];
    const f = runAudit(input(portfolio({ bills: all }), { metered: new Map(bills.map((b) => [b.billId, metered(1000)])) })).filter((x) => x.severity !== "info");
    expect(f.map((x) => `${x.check}:${x.billId}`)).toEqual(["usage-vs-meter:E1:2024-07-01"]);
    expect(f[0].evidence.notes.some((n) => n.startsWith("Also explains usage-outlier"))).toBe(true);
  });
});

describe("ranking and outputs", () => {
  const f: Finding[] = runAudit(input(portfolio({
    bills: [bill("2024-01-01", "2024-02-01", { total: 160 }), bill("2024-03-01", "2024-04-01", { total: 400 }), bill("2024-04-01", "2024-05-01", { total: 150 })],
  }), {
    priced: new Map([["E1:2024-01-01", computed([["Energy", 150]])], ["E1:2024-03-01", computed([["Energy", 150]])], ["E1:2024-04-01", computed([["Energy", 150]])]]),
  }));
  it("sorts by |amount at stake| descending, then severity", () => {
    expect(f.map((x) => [x.check, x.amountAtStake])).toEqual([["total-mismatch", 250], ["total-mismatch", 10], ["period-gap", null]]);
  });
  it("CSV rows have exactly the contract's columns; amount empty when not money", () => {
    const rows = findingsToCsvRows(f);
    expect(Object.keys(rows[0])).toEqual(["building_id", "meter_id", "bill_id", "period_start", "period_end", "check", "severity", "amount_at_stake", "message"]);
    expect(rows[0].amount_at_stake).toBe("250.00");
    expect(rows[2].amount_at_stake).toBe("");
    const text = findingsToCsvText(f);
    expect(text.split("\r\n")[0]).toBe(FINDINGS_CSV_COLUMNS.join(","));
    expect(text.split("\r\n")[1]).toMatch(/^B1,E1,E1:2024-03-01,2024-03-01,2024-04-01,total-mismatch,error,250.00,"Billed 400.00 USD/);
  });
  it("JSON objects carry the snake_case keys plus title and evidence", () => {
    const j = toFindingsJson(f);
    expect(j[0]).toMatchObject({ building_id: "B1", bill_id: "E1:2024-03-01", check: "total-mismatch", amount_at_stake: 250 });
    expect(j[2].amount_at_stake).toBeNull();
    expect(j[0].evidence.rows.length).toBeGreaterThan(0);
  });
  it("--fail-on thresholds", () => {
    expect(reachesSeverity(f, "error")).toBe(true);
    expect(reachesSeverity(f.filter((x) => x.severity !== "error"), "error")).toBe(false);
    expect(reachesSeverity(f.filter((x) => x.severity !== "error"), "warning")).toBe(true);
  });
  it("check codes are the 13 of the outputs contract", () => {
    expect(CHECK_CODES).toHaveLength(13);
  });
});
