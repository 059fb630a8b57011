/** Chart text wrapping (src/site/charts/wrapText.ts): titles and ranking labels break onto lines instead of being cut short. */
import { describe, expect, it } from "vitest";
import { TITLE_LINE_CHARS, chartTitle, wrapLabel } from "../../src/site/charts/wrapText.ts";
import { rankingSpec } from "../../src/site/charts/analysisSpecs.ts";
import { renderSvg } from "../../src/site/charts/renderSvg.ts";

describe("wrapLabel", () => {
  it("breaks at spaces into lines of at most max characters, keeping every word", () => {
    expect(wrapLabel("Billed usage differs from the interval meter", 22)).toEqual(["Billed usage differs", "from the interval", "meter"]);
    expect(wrapLabel("Short", 22)).toEqual(["Short"]);
    // A word longer than a line stays whole on its own line.
    expect(wrapLabel("a Supercalifragilisticexpialidocious b", 10)).toEqual(["a", "Supercalifragilisticexpialidocious", "b"]);
  });

  it("chart titles wrap only when longer than a line, and sit against the whole chart", () => {
    expect(chartTitle("Electricity use by month (kWh)")).toEqual({ text: "Electricity use by month (kWh)", frame: "bounds" });
    const long = chartTitle("Meter WHS-E: use per day against outdoor temperature");
    expect(long.text).toEqual(["Meter WHS-E: use per day against", "outdoor temperature"]);
    for (const line of long.text as string[]) expect(line.length).toBeLessThanOrEqual(TITLE_LINE_CHARS);
  });
});

describe("ranking chart labels", () => {
  it("draws a long label whole, on several lines, with no ellipsis (server SVG)", async () => {
    const chart = {
      kind: "ranking" as const,
      id: "r",
      title: "Money at stake by check (USD)",
      description: "Ranking",
      valueLabel: "Money at stake (USD)",
      valueFormat: ",.2f",
      table: { caption: "", columns: [], rows: [], sortable: false },
      items: [
        { label: "Billed usage differs from the interval meter", value: 1381.2, note: "1 finding" },
        // User text (a building name) with a quote and a backslash, long enough to be wrapped.
        { label: `Quote " and back\\slash in a long building name`, value: 10, note: "" },
      ],
    };
    const svg = await renderSvg(rankingSpec(chart));
    expect(svg).not.toContain("…");
    for (const line of ["Billed usage differs", "from the interval", "meter", "Money at stake (USD)", `Quote " and back\\slash`, "in a long building", "name"]) expect(svg).toContain(`>${line}<`);
  });

  it("a ranking of 1,500 wrapped labels renders (a thousand-building portfolio's index chart)", async () => {
    const items = Array.from({ length: 1500 }, (_, i) => ({ label: `Harbour Row building number ${i + 1}`, value: 1500 - i, note: "" }));
    const chart = {
      kind: "ranking" as const, id: "big", title: "Energy use intensity", description: "Ranking", valueLabel: "kWh per m²", valueFormat: ",.0f",
      table: { caption: "", columns: [], rows: [], sortable: false }, items,
    };
    const svg = await renderSvg(rankingSpec(chart));
    expect(svg).toContain(">Harbour Row building<");
    expect(svg).toContain(">number 1500<");
    expect(svg).not.toContain("…");
  }, 60_000);
});
