/** The printable claim sheet of one dispute. Fixture disputes: test/report/disputeFixture.ts. */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtemp, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { writeSite } from "../../src/site/writeSite.ts";
import { buildClaimSheet, buildClaimSheets } from "../../src/report/claimSheet.ts";
import { EVIL_NAME, fixtureInput } from "./fixture.ts";
import { DUPLICATE_CLAIM, GAP_RISK, LINE_CLAIM, MULTIPLIER_CLAIM, disputeFixture } from "./disputeFixture.ts";

const portfolio = fixtureInput().portfolio;
const building = (id: string) => portfolio.buildings.find((b) => b.buildingId === id);
const value = (items: { label: string; value: string }[], label: string): string | undefined => items.find((i) => i.label === label)?.value;

describe("claim sheet", () => {
  it("heads the sheet with the dispute's own figures: portfolio, building, account, meter, bills, period, claim", () => {
    const s = buildClaimSheet(MULTIPLIER_CLAIM, portfolio, building("B2"), "Jan 15, 2026");
    expect(s.path).toBe("claims/D-E2-2024-08.html");
    expect(s.root).toBe("../");
    expect(s.title).toBe(`Claim: ${EVIL_NAME}, bills E2-08, E2-09`);
    expect(s.kindLabel).toBe("Billing claim");
    expect(s.amountLabel).toBe("Claim (billed − corrected)");
    expect(s.amount).toBe("$24,967.83");
    expect(value(s.header, "Portfolio")).toBe("Tern Lake Holdings");
    expect(value(s.header, "Building")).toBe(EVIL_NAME);
    expect(value(s.header, "Utility account")).toBe("ACC-<7>&\"9\"");
    expect(value(s.header, "Meter")).toBe("E2");
    expect(value(s.header, "Bills")).toBe("E2-08, E2-09");
    expect(value(s.header, "Service period")).toBe("Aug 5, 2024 – Oct 4, 2024");
    expect(value(s.header, "Billed")).toBe("$49,935.66");
    expect(value(s.header, "Corrected")).toBe("$24,967.83");
    expect(value(s.header, "Corrected on")).toBe("Wrong meter multiplier");
    expect(value(s.header, "Checks")).toBe("Meter multiplier looks wrong; Billed use and the meter disagree; Total does not add up under the tariff");
    expect(value(s.header, "Prepared")).toBe("Jan 15, 2026");
    expect(s.what).toBe("Billed usage is twice what the meter recorded");
    expect(s.explanation).toBe("Usage and demand on both bills are exactly 2 × the interval data.");
    expect(s.basisText).toMatch(/^The bill's usage and demand are a multiple of what the meter recorded/);
  });

  it("for each bill: totals, tariff and versions, printed beside corrected lines, the arithmetic, billed vs metered vs corrected quantities", () => {
    const s = buildClaimSheet(MULTIPLIER_CLAIM, portfolio, building("B2"), "Jan 15, 2026");
    expect(s.bills).toHaveLength(2);
    const b = s.bills[0];
    expect(b.heading).toBe("Bill E2-08, Aug 5, 2024 – Sep 4, 2024");
    expect(b.anchor).toBe("bill-E2-08");
    // Totals stand at the foot of the line table; a bill without lines has them in its facts.
    expect(value(b.facts, "Billed total")).toBeUndefined();
    expect(value(s.bills[1].facts, "Billed total")).toBe("$24,967.83");
    expect(value(s.bills[1].facts, "Corrected total")).toBe("$12,483.91");
    expect(value(s.bills[1].facts, "Difference (billed − corrected)")).toBe("+\u2060$12,483.92");
    expect(value(b.facts, "Tariff")).toBe("T-electricity");
    expect(value(b.facts, "Tariff versions applied")).toBe("version in force from Jan 1, 2023: 31 billing days (100%)");
    expect(value(b.facts, "Corrected bill priced on")).toBe("metered usage and demand (interval data, multiplier 1)");
    expect(b.lines!.columns.map((c) => c.label)).toEqual(["Line", "Printed", "Corrected", "Difference (printed − corrected)"]);
    expect(b.lines!.rows[1].map((c) => c.text)).toEqual(["Energy", "$24,942.83", "$12,458.92", "+\u2060$12,483.91"]);
    expect(b.lines!.foot!.map((c) => c.text)).toEqual(["Bill total", "$24,967.83", "$12,483.92", "+\u2060$12,483.91"]);
    expect(b.arithmetic!.rows[1].map((c) => c.text)).toEqual(["Energy", "100,000 kWh", "$0.124589 per kWh", "$12,458.92", "flat rate"]);
    expect(b.quantities.rows.map((r) => r.map((c) => c.text))).toEqual([
      ["Usage (kWh)", "200,000 kWh", "100,000 kWh", "100,000 kWh"],
      ["Demand (kW)", "400 kW", "200 kW", "200 kW"],
    ]);
    expect(b.quantities.caption).toMatch(/after any ratchet or minimum/);
    expect(b.notes).toEqual(["Usage converted from interval data over the local service period."]);
    expect(b.billsHref).toBe("bills/B2/E2.html#bill-E2-08");
    // A bill without lines or demand: no line tables, usage only, "no interval data" said in words.
    expect(s.bills[1].lines).toBeNull();
    expect(s.bills[1].arithmetic).toBeNull();
    expect(s.bills[1].quantities.rows.map((r) => r.map((c) => c.text))).toEqual([["Usage (kWh)", "10,000 kWh", "no interval data", "10,000 kWh"]]);
  });

  it("shows a printed line the tariff has no charge for, and lines without a quantity, without inventing numbers", () => {
    const s = buildClaimSheet(LINE_CLAIM, portfolio, building("B1"), "Jan 15, 2026");
    const lines = s.bills[0].lines!;
    expect(lines.rows.map((r) => r.map((c) => c.text))).toEqual([
      ["Energy", "$3,369.33", "$3,369.33", "$0.00"],
      ["Sales tax", "$282.27", "$210.67", "+\u2060$71.60"],
      ["Meter access fee", "$0.00", "—", "—"],
    ]);
    expect(s.bills[0].arithmetic!.rows.map((r) => r[0].text)).toEqual(["Energy", "Sales tax"]);
    expect(s.bills[0].arithmetic!.rows[1].map((c) => c.text)).toEqual(["Sales tax", "—", "—", "$210.67", "6.25 % of 3,369.33"]);
    expect(s.related).toEqual([{ billId: "E1-04", href: "bills/B1/E1.html#bill-E1-04" }]);
    expect(value(s.header, "Bill")).toBe("E1-05");
    expect(value(s.header, "Utility account")).toBe("100-200");
  });

  it("prints quantities exactly enough to redo the sum, a tax base as money and its rate as a percentage", () => {
    const d = structuredClone(LINE_CLAIM);
    d.bills[0].billedUsage = 349_577.92;
    d.bills[0].lines[1] = { ...d.bills[0].lines[1], quantity: 47_159.26, unit: "USD", rate: 0.045 };
    const s = buildClaimSheet(d, portfolio, building("B1"), "Jan 15, 2026");
    expect(s.bills[0].arithmetic!.rows[1].map((c) => c.text).slice(0, 3)).toEqual(["Sales tax", "$47,159.26", "4.5%"]);
    expect(s.bills[0].quantities.rows[0][1].text).toBe("349,577.92 kWh");
  });

  it("a duplicate: corrected total zero, the whole bill claimed", () => {
    const s = buildClaimSheet(DUPLICATE_CLAIM, portfolio, building("B1"), "Jan 15, 2026");
    expect(s.amount).toBe("$826.90");
    expect(value(s.bills[0].facts, "Corrected total")).toBe("$0.00");
    expect(s.kindLabel).toBe("Billing claim");
    expect(s.basisText).toMatch(/billed twice/);
  });

  it("a back-billing risk is worded as a budget note, with the estimate's range, not as a claim", () => {
    const s = buildClaimSheet(GAP_RISK, portfolio, building("B1"), "Jan 15, 2026");
    expect(s.kindLabel).toBe("Budget note: possible back-billing");
    expect(s.title).toBe("Budget note: Heron Street Office, E1, Aug 5, 2024 – Sep 4, 2024");
    expect(s.amountLabel).toBe("Not yet billed (corrected − billed)");
    expect(s.amount).toBe("$5,693.48");
    expect(value(s.header, "Bills")).toBe("none (period not billed)");
    expect(s.rangeText).toBe("The corrected total is an estimate: between $5,100.12 and $6,301.90, $5,693.48 most likely.");
    expect(s.cautions.join(" ")).toMatch(/not money to claim/);
    expect(s.cautions.join(" ")).not.toMatch(/raise claims/);
    expect(s.bills).toEqual([]);
  });

  it("carries the cautions and links back to the building, the meter's bills and the dispute list (relative, no navigation marked current)", () => {
    const s = buildClaimSheet(LINE_CLAIM, portfolio, building("B1"), "Jan 15, 2026");
    const cautions = s.cautions.join(" ");
    expect(cautions).toMatch(/approved by the regulator governs/);
    expect(cautions).toMatch(/dispute procedure/);
    expect(cautions).toMatch(/look-back limit/);
    expect(cautions).toMatch(/lead to verify/);
    expect(s.buildingHref).toBe("buildings/B1.html");
    expect(s.meterBillsHref).toBe("bills/B1/E1.html");
    expect(s.disputesHref).toBe("disputes.html");
    expect(s.nav.every((n) => !n.current && n.href.startsWith("../"))).toBe(true);
  });

  it("one sheet per dispute; a dispute id outside the file-safe set still gets its own page", () => {
    const list = disputeFixture();
    list.push({ ...structuredClone(LINE_CLAIM), disputeId: "D:odd" });
    const sheets = buildClaimSheets(list, portfolio, "Jan 15, 2026");
    expect(sheets).toHaveLength(6);
    expect(new Set(sheets.map((s) => s.path)).size).toBe(6);
    expect(sheets.find((s) => s.disputeId === "D:odd")!.path).toBe("claims/D~3aodd.html");
  });
});

describe("claim sheet of a period nobody billed", () => {
  it("names the period, not an empty bill id, in its heading and captions", () => {
    const d = structuredClone(GAP_RISK);
    d.bills = [{ ...structuredClone(LINE_CLAIM.bills[0]), billId: "", billedTotal: 0, correctedTotal: 5_693.48, claimAmount: -5_693.48, billedUsage: null, lines: [{ label: "Energy", printed: null, corrected: 5_693.48, difference: null, quantity: 45_000, unit: "kWh", rate: 0.1265218, note: null, status: "estimated" }] }];
    const s = buildClaimSheet(d, portfolio, building("B1"), "Jan 15, 2026");
    const b = s.bills[0];
    expect(b.heading).toBe("Period not billed, May 5, 2024 – Jun 4, 2024");
    expect(b.lines!.caption).toBe("Period not billed: the lines the period would have been billed, in USD");
    expect(b.arithmetic!.caption).toMatch(/^Period not billed: /);
    expect(b.quantities.caption).toMatch(/^Period not billed: /);
    expect(b.quantities.rows[0][1].text).toBe("—");
    expect(b.arithmetic!.rows[0][4].text).toBe("estimated");
    expect(b.billsHref).toBe("bills/B1/E1.html");
  });
});

describe("the rendered pages escape user text", () => {
  // Renders the fixture (a building named like a script, an account with < & ") through the
  // real templates: names must appear as text, never as markup.
  let work = "";
  let pages: Record<string, string> = {};

  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-claims-"));
    const input = fixtureInput();
    input.disputes = disputeFixture();
    await writeSite(buildSiteModel(input), { "disputes.csv": "dispute_id\n", "disputes.json": "[]\n" }, join(work, "site"));
    for (const path of ["index.html", "disputes.html", "claims/D-E2-2024-08.html", "claims/D-E1-gap.html"]) pages[path] = await readFile(join(work, "site", path), "utf8");
  }, 60_000);

  afterAll(async () => {
    if (work) await rm(work, { recursive: true, force: true });
  });

  it("shows a building name and an account with <, & and \" as text on the index, the dispute list and the claim sheet", () => {
    const name = "&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;Annex&quot;";
    for (const [path, html] of Object.entries(pages)) {
      expect(html, path).not.toContain("<script>alert(1)");
      if (path !== "claims/D-E1-gap.html") expect(html, path).toContain(name);
    }
    expect(pages["claims/D-E2-2024-08.html"]).toContain("ACC-&lt;7&gt;&amp;&quot;9&quot;");
  });

  it("the claim sheet: relative links only, the amount, the cautions, no sort controls", () => {
    const html = pages["claims/D-E2-2024-08.html"];
    expect(html).toContain('<strong id="claim-amount">$24,967.83</strong>');
    expect(html).toContain('href="../buildings/B2.html"');
    expect(html).toContain('href="../bills/B2/E2.html#bill-E2-08"');
    expect(html).toContain('href="../disputes.html"');
    expect(html).not.toMatch(/<a [^>]*href="\//);
    expect(html).not.toContain("data-sortable");
    expect(html).toMatch(/approved by the regulator governs/);
  });

  it("the dispute list totals the claims and offers the dispute files", () => {
    const html = pages["disputes.html"];
    expect(html).toContain('data-total="25866.33">$25,866.33</td>');
    expect(html).toContain('href="data/disputes.csv"');
    expect(html).toContain('href="claims/D-E2-2024-08.html"');
    expect(pages["index.html"]).toContain('id="dispute-total" href="disputes.html"');
  });
});
