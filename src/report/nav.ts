/** Site navigation with links relative to the page showing it, so the site works under any path prefix. */
import type { NavLink } from "./siteModel.ts";

export type PageKey = "index" | "buildings" | "forecast" | "disputes" | "methods" | "data" | "building";

/**
 * Navigation links for a page at depth given by `root` ("" at the site root, "../" one level down).
 * The two lists of every building stand beside the dispute list, so a large portfolio's building
 * is two clicks from any page although the index shows only the first rows (indexSubset.ts).
 * @example navFor("methods", "")[4] // { label: "Methods", href: "methods.html", current: true }
 */
export function navFor(current: PageKey, root: string): NavLink[] {
  return [
    { label: "Portfolio", href: `${root}index.html`, current: current === "index" },
    { label: "Bills to dispute", href: `${root}${DISPUTES_PATH}`, current: current === "disputes" },
    { label: "Buildings", href: `${root}${BUILDING_LIST_PATH}`, current: current === "buildings" },
    { label: "Next year's cost", href: `${root}${FORECAST_LIST_PATH}`, current: current === "forecast" },
    { label: "Methods", href: `${root}methods.html`, current: current === "methods" },
    { label: "Data and downloads", href: `${root}data.html`, current: current === "data" },
  ];
}

/**
 * Canonical URL path of a page: the portfolio's `base_path` (starts and ends with "/") + the
 * page path. Only `<link rel="canonical">` uses it; links between pages stay relative.
 * @example canonicalFor("/reports/", "buildings/B1.html") // "/reports/buildings/B1.html"
 */
export function canonicalFor(basePath: string, path: string): string {
  const base = basePath.endsWith("/") ? basePath : `${basePath}/`;
  return `${base.startsWith("/") ? base : `/${base}`}${path}`;
}

/** Path of a building page relative to the site root; building ids are `[A-Za-z0-9_-]+` (inputs.md). */
export function buildingPath(buildingId: string): string {
  return `buildings/${encodeURIComponent(buildingId)}.html`;
}

/** The dispute list (every claim and back-billing risk), relative to the site root. */
export const DISPUTES_PATH = "disputes.html";

/** The table of every building (the index shows only the first rows of a long portfolio). */
export const BUILDING_LIST_PATH = "buildings.html";

/** Next year's cost against last year of every building with a forecast. */
export const FORECAST_LIST_PATH = "forecast.html";

/**
 * A text made safe for a file name or fragment: letters, digits, `_` and `-` stay; every other
 * character becomes `~` + its code point in hex (injective, so two ids never share a name).
 * @example fileSafe("M:1") // "M~3a1"
 */
export function fileSafe(text: string): string {
  return text.replace(/[^A-Za-z0-9_-]/gu, (c) => `~${c.codePointAt(0)!.toString(16)}`);
}

/** The printable claim sheet of one dispute; dispute ids are file-safe by contract (src/disputes/types.ts). */
export function claimPath(disputeId: string): string {
  return `claims/${fileSafe(disputeId)}.html`;
}

/** The page with one meter's bills and the line-by-line re-pricing of each. */
export function meterBillsPath(buildingId: string, meterId: string): string {
  return `bills/${fileSafe(buildingId)}/${fileSafe(meterId)}.html`;
}

/** Fragment id of one bill's re-pricing on its meter's bills page. */
export function billAnchor(billId: string): string {
  return `bill-${fileSafe(billId)}`;
}
