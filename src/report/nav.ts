/** Site navigation with links relative to the page showing it, so the site works under any path prefix. */
import type { NavLink } from "./siteModel.ts";

export type PageKey = "index" | "methods" | "data" | "building";

/**
 * Navigation links for a page at depth given by `root` ("" at the site root, "../" one level down).
 * @example navFor("methods", "")[1] // { label: "Methods", href: "methods.html", current: true }
 */
export function navFor(current: PageKey, root: string): NavLink[] {
  return [
    { label: "Portfolio", href: `${root}index.html`, current: current === "index" },
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
