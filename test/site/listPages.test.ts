/**
 * A long portfolio's index renders its two per-building lists cut, with the link to the page of
 * each whole list; the list pages render every building with relative links. Only the portfolio
 * pages are rendered (the model's per-building pages are dropped): the HTML is what is checked.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtemp, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { writeSite } from "../../src/site/writeSite.ts";
import { manyBuildingsInput } from "../report/fixture.ts";

/** The body rows of the table whose caption starts with `caption`. */
function tableRows(html: string, caption: string): string[] {
  const start = html.indexOf(`<caption>${caption}`);
  expect(start, caption).toBeGreaterThan(-1);
  const body = html.slice(html.indexOf("<tbody>", start), html.indexOf("</tbody>", start));
  return body.split("<tr>").slice(1);
}

describe("the lists of every building, rendered", () => {
  let work: string;
  const pages: Record<string, string> = {};

  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-lists-"));
    const model = buildSiteModel(manyBuildingsInput(24));
    await writeSite({ ...model, buildings: [], meterBills: [], tenants: [], claims: [] }, {}, join(work, "site"));
    for (const path of ["index.html", "buildings.html", "forecast.html"]) pages[path] = await readFile(join(work, "site", path), "utf8");
  }, 60_000);

  afterAll(async () => {
    if (work) await rm(work, { recursive: true, force: true });
  });

  it("the index shows 10 rows of each list, says which, and links each whole list relatively", () => {
    const index = pages["index.html"];
    expect(tableRows(index, "Buildings: floor area")).toHaveLength(10);
    expect(tableRows(index, "Buildings ranked by the forecast change")).toHaveLength(10);
    expect(index).toContain("<p class=\"more\">Showing the 10 of 24 buildings with the largest billed cost over the last 12 months, largest first. Together they were billed");
    expect(index).toContain('<a href="buildings.html">All 24 buildings</a>: the same columns');
    expect(index).toContain("<p class=\"more\">Showing the 10 of 24 buildings whose cost changes most, up or down");
    expect(index).toContain('<a href="forecast.html">Next year&#39;s cost of all 24 buildings</a>, ranked by the change');
    // both lists sit before the sections a reader looks for below them
    expect(index.lastIndexOf('href="buildings.html">All 24')).toBeLessThan(index.indexOf('id="headline-h"'));
  });

  it("buildings.html and forecast.html hold every building, sortable, linked relatively, in the navigation", () => {
    const list = pages["buildings.html"];
    const rows = tableRows(list, "Buildings: floor area");
    expect(rows).toHaveLength(24);
    expect(rows[0]).toContain('<a href="buildings/B1.html">');
    expect(list).toContain("<table class=\"stack\" data-sortable>");
    expect(list).toContain('<link rel="canonical" href="/reports/buildings.html"');
    expect(list).toContain('<li><a href="buildings.html" aria-current="page">Buildings</a></li>');
    // every link relative (only the canonical link carries base_path), so any path prefix works
    expect(list).not.toContain('<a href="/');
    const forecast = pages["forecast.html"];
    expect(tableRows(forecast, "Buildings ranked by the forecast change")).toHaveLength(24);
    expect(forecast).toContain("Over all 24 buildings the changes add up to +\u2060$1,200.00");
    expect(forecast).toContain('<li><a href="forecast.html" aria-current="page">Next year&#39;s cost</a></li>');
    expect(forecast).not.toContain('<a href="/');
  });
});
