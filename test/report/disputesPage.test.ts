/** The dispute list, the index's dispute block and the findings-by-check table. Fixture disputes: test/report/disputeFixture.ts. */
import { describe, expect, it } from "vitest";
import { readFile } from "node:fs/promises";
import { buildMethodsPage } from "../../src/report/methodsPage.ts";
import { prepareSite } from "../../src/site/prepareSite.ts";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { INDEX_CLAIM_LIMIT, buildDisputesPage, buildIndexDisputes, sumCents } from "../../src/report/disputesPage.ts";
import { findingsByCheckTable } from "../../src/report/portfolioCharts.ts";
import { EVIL_NAME, fixtureInput } from "./fixture.ts";
import { disputeFixture, manyClaims } from "./disputeFixture.ts";

const money = (n: number): string => new Intl.NumberFormat("en-US", { style: "currency", currency: "USD" }).format(n);

function inputWith(disputes = disputeFixture()) {
  const input = fixtureInput();
  input.disputes = disputes;
  return input;
}

describe("sumCents", () => {
  it("adds two-decimal amounts exactly (0.1 + 0.2 = 0.3, as a spreadsheet sums disputes.csv)", () => {
    expect(sumCents([0.1, 0.2])).toBe(0.3);
    expect(sumCents([24_967.83, 71.6, 826.9])).toBe(25_866.33);
    expect(sumCents([])).toBe(0);
  });
});

describe("index: bills to dispute", () => {
  it("the tile is the sum of claimAmount over kind claim; back-billing risks are not in it", () => {
    const d = buildIndexDisputes(inputWith())!;
    // Claims of the fixture: 24,967.83 (multiplier) + 71.60 (tax line) + 826.90 (duplicate).
    expect(d.claimTotal).toBe("$25,866.33");
    expect(d.claimCount).toBe("3 claims covering 4 bills");
    // Risks: 5,693.48 (gap) + 12.34 (bill too low), shown as what may still be billed.
    expect(d.riskTotal).toBe("$5,705.82");
    expect(d.riskCount).toBe("2 risks");
    expect(d.href).toBe("disputes.html");
  });

  it("lists claims largest first with the dispute's own figures and a claim sheet link", () => {
    const d = buildIndexDisputes(inputWith())!;
    const rows = d.claims!.rows;
    expect(rows.map((r) => r.disputeId)).toEqual(["D-E2-2024-08", "D-G1-dup", "D-E1-05"]);
    expect(rows[0]).toMatchObject({
      building: EVIL_NAME,
      buildingHref: "buildings/B2.html",
      meter: "E2",
      account: "ACC-<7>&\"9\"",
      meterText: "Meter E2 · account ACC-<7>&\"9\"",
      bills: "E2-08, E2-09",
      period: "Aug 5, 2024 – Oct 4, 2024",
      title: "Billed usage is twice what the meter recorded",
      billed: "$49,935.66",
      corrected: "$24,967.83",
      amount: "$24,967.83",
      amountSort: "24967.83",
      basis: "Wrong meter multiplier",
      sheetHref: "claims/D-E2-2024-08.html",
      sheetLabel: "Claim sheet for bills E2-08, E2-09",
    });
    expect(d.claims!.totals).toEqual([{ label: "Total, 3 claims", billed: "$54,414.16", corrected: "$28,547.83", amount: "$25,866.33", amountSort: "25866.33" }]);
    expect(d.moreText).toBeNull();
  });

  it("lists back-billing risks apart, as positive amounts not yet billed, with the estimate's range", () => {
    const d = buildIndexDisputes(inputWith())!;
    expect(d.risks!.amountLabel).toBe("Not yet billed");
    expect(d.risks!.caption).toMatch(/may bill it later/);
    expect(d.risks!.rows.map((r) => [r.disputeId, r.amount, r.bills])).toEqual([
      ["D-E1-gap", "$5,693.48", "none (period not billed)"],
      ["D-E2-low", "$12.34", "E2-03"],
    ]);
    expect(d.risks!.rows[0].corrected).toBe("$5,693.48");
    expect(d.risks!.rows[0].correctedNote).toBe("range $5,100.12 – $6,301.90");
    expect(d.risks!.rows[1].correctedNote).toBeNull();
    expect(d.risks!.rows[0].meterText).toBe("Meter E1");
    expect(d.risks!.rows[0].sheetLabel).toBe("Budget note for E1, Aug 5, 2024 – Sep 4, 2024");
    expect(d.risks!.totals[0]).toEqual({ label: "Total, 2 risks", billed: "$1,000.00", corrected: "$6,705.82", amount: "$5,705.82", amountSort: "5705.82" });
  });

  it("shows the 10 largest claims and links to the full list when there are more; the footer still totals all of them", () => {
    const claims = manyClaims(12);
    const d = buildIndexDisputes(inputWith(claims))!;
    expect(d.claims!.rows).toHaveLength(INDEX_CLAIM_LIMIT);
    expect(d.claims!.rows[0].amount).toBe("$12.12");
    expect(d.moreText).toBe("Showing the 10 largest of 12 claims.");
    // 1.01 × (1 + … + 12) = 78.78; the ten largest: 78.78 − 1.01 − 2.02 = 75.75.
    expect(d.claims!.totals.map((t) => [t.label, t.amount])).toEqual([
      ["Total of these 10", "$75.75"],
      ["Total, all 12 claims", "$78.78"],
    ]);
    expect(d.claimTotal).toBe("$78.78");
    expect(d.risks).toBeNull();
  });

  it("shows the 10 largest back-billing risks when there are more (a large portfolio's index stays short), the footer totalling all of them", () => {
    // Risks: billed 100, corrected 100 + 1.01 × k, so "not yet billed" is 1.01 × k for k = 1 … 13.
    const risks = manyClaims(13).map((d) => ({ ...d, disputeId: d.disputeId.replace("many", "risk"), kind: "back-bill-risk" as const, billedTotal: d.correctedTotal, correctedTotal: d.billedTotal, claimAmount: d.correctedTotal - d.billedTotal }));
    const d = buildIndexDisputes(inputWith(risks))!;
    expect(d.risks!.rows).toHaveLength(INDEX_CLAIM_LIMIT);
    expect(d.risks!.rows[0].amount).toBe("$13.13");
    expect(d.risks!.caption).toMatch(/the 10 largest of 13 risks/);
    expect(d.riskMoreText).toBe("Showing the 10 largest of 13 risks.");
    // 1.01 × (1 + … + 13) = 91.91; the ten largest: 91.91 − 1.01 × (1 + 2 + 3) = 85.85.
    expect(d.risks!.totals.map((t) => [t.label, t.amount])).toEqual([
      ["Total of these 10", "$85.85"],
      ["Total, all 13 risks", "$91.91"],
    ]);
    expect(d.riskTotal).toBe("$91.91");
    expect(buildIndexDisputes(inputWith())!.riskMoreText).toBeNull();
  });

  it("has no dispute block when the dispute stage did not run, and an empty one when nothing is disputed", () => {
    expect(buildIndexDisputes(fixtureInput())).toBeNull();
    const none = buildIndexDisputes(inputWith([]))!;
    expect(none).toMatchObject({ claimTotal: "$0.00", claimCount: "no claims", riskTotal: "$0.00", riskCount: "no risks", claims: null, risks: null });
  });

  it("the building table's To dispute column sums each building's claims and links to the dispute list", () => {
    const model = buildSiteModel(inputWith());
    const t = model.index.buildingsTable;
    const i = t.columns.findIndex((c) => c.label === "To dispute");
    expect(t.columns.some((c) => c.label === "Money at stake")).toBe(false);
    expect(t.rows[0][i]).toMatchObject({ text: "$898.50", sort: "898.5", href: "disputes.html" });
    expect(t.rows[1][i]).toMatchObject({ text: "$24,967.83", href: "disputes.html" });
    expect(sumCents(t.rows.map((r) => Number(r[i].sort)))).toBe(25_866.33);
    expect(model.index.headline.some((h) => /money at stake/i.test(h.label))).toBe(false);
  });
});

describe("the dispute list page", () => {
  it("totals every claim with the same figure as the index tile, and lists every risk", () => {
    const input = inputWith([...disputeFixture(), ...manyClaims(12)]);
    const page = buildDisputesPage(input);
    const tile = buildIndexDisputes(input)!;
    expect(page.path).toBe("disputes.html");
    expect(page.nav.find((n) => n.current)!.label).toBe("Bills to dispute");
    expect(page.claims!.rows).toHaveLength(15);
    expect(page.claims!.totals).toHaveLength(1);
    expect(page.claims!.totals[0].amount).toBe(tile.claimTotal);
    expect(page.summary[0]).toEqual({ label: "Bills to dispute (total of the claims)", value: tile.claimTotal });
    expect(page.risks!.rows).toHaveLength(2);
    expect(money(25_866.33 + 78.78)).toBe(tile.claimTotal);
  });

  it("states the cautions: leads to verify, the regulator-approved tariff governs, the dispute procedure and look-back apply", () => {
    const text = buildDisputesPage(inputWith()).cautions.join(" ");
    expect(text).toMatch(/lead to verify/);
    expect(text).toMatch(/approved by the regulator governs/);
    expect(text).toMatch(/dispute procedure/);
    expect(text).toMatch(/look-back/);
  });

  it("has an empty state", () => {
    const page = buildDisputesPage(inputWith([]));
    expect(page.claims).toBeNull();
    expect(page.risks).toBeNull();
    expect(page.summary[1].value).toBe("none");
  });

  it("offers disputes.csv and disputes.json for download only when the build wrote them", async () => {
    const model = buildSiteModel(inputWith());
    const ready = await prepareSite(model, { "disputes.csv": "dispute_id\n", "disputes.json": "[]\n", "findings.csv": "x\n" });
    expect(ready.disputes.downloads.map((f) => [f.name, f.href])).toEqual([
      ["disputes.csv", "data/disputes.csv"],
      ["disputes.json", "data/disputes.json"],
    ]);
    expect(ready.disputes.downloads[0].description).toMatch(/claim or back-billing risk/);
    expect((await prepareSite(model, {})).disputes.downloads).toEqual([]);
  }, 30_000);

  it("is in the site model with one claim sheet per dispute", () => {
    const model = buildSiteModel(inputWith());
    expect(model.disputes.canonical).toBe("/reports/disputes.html");
    expect(model.claims.map((c) => c.path).sort()).toEqual(disputeFixture().map((d) => `claims/${d.disputeId}.html`).sort());
  });
});

describe("findings by check", () => {
  it("counts findings per check and adds the claims and risks of which the check is the root cause", () => {
    const input = inputWith();
    const t = findingsByCheckTable(input.findings, input.disputes, "USD")!;
    expect(t.columns.map((c) => c.label)).toEqual(["Check", "Findings", "Claims", "Claimed", "Back-billing risks", "May be billed later"]);
    const byCheck = new Map(t.rows.map((r) => [r[0].text, r.slice(1).map((c) => c.text)]));
    expect(byCheck.get("Meter multiplier looks wrong")).toEqual(["0", "1", "$24,967.83", "0", "—"]);
    expect(byCheck.get("The same period billed twice")).toEqual(["0", "1", "$826.90", "0", "—"]);
    expect(byCheck.get("Days that no bill covers")).toEqual(["0", "0", "—", "1", "$5,693.48"]);
    // Fixture findings: one total mismatch (with money) and one estimated read.
    expect(byCheck.get("Total does not add up under the tariff")).toEqual(["1", "0", "—", "1", "$12.34"]);
    expect(byCheck.get("Bill based on an estimate, not a reading")).toEqual(["1", "0", "—", "0", "—"]);
    // Largest claimed first; the claimed column adds up to the index tile.
    expect(t.rows[0][0].text).toBe("Meter multiplier looks wrong");
    expect(sumCents(t.rows.map((r) => Number(r[3].sort)))).toBe(25_866.33);
  });

  it("without disputes shows counts only; without findings or disputes there is no table", () => {
    const input = fixtureInput();
    expect(findingsByCheckTable(input.findings, undefined, "USD")!.columns.map((c) => c.label)).toEqual(["Check", "Findings"]);
    expect(findingsByCheckTable(undefined, undefined, "USD")).toBeNull();
    expect(findingsByCheckTable([], [], "USD")).toBeNull();
  });
});

describe("methods page on disputes", () => {
  it("explains every basis, and says the evidence is on the claim sheet (not in a building audit section)", async () => {
    const page = buildMethodsPage("USD", "the 12 months up to each meter's last read", { usagePct: 2, demandPct: 3, costAbs: 1, costPct: 0.5 });
    expect(page.disputeBases.map((b) => b.label)).toEqual([
      "Tariff, on the billed quantities",
      "Interval meter readings",
      "Billed twice",
      "Days already billed",
      "Days no bill covers",
      "Wrong meter multiplier",
      "Rate not in force for the period",
    ]);
    expect(page.disputeBases.every((b) => b.value.length > 40)).toBe(true);
    const template = await readFile("content/methods.njk", "utf8");
    expect(template).not.toMatch(/audit section/);
    expect(template).toMatch(/claim sheet/);
    expect(template).toMatch(/Claim = billed − corrected/);
  });
});
