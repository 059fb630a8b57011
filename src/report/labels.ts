/** Plain-language labels for codes that appear on pages. */
import type { Commodity } from "../domain/types.ts";
import type { LineStatus } from "../tariff/index.ts";

/** @example commodityLabel("gas") // "Gas" */
export function commodityLabel(c: Commodity | string): string {
  switch (c) {
    case "electricity":
      return "Electricity";
    case "gas":
      return "Gas";
    case "water":
      return "Water";
    default:
      return String(c);
  }
}

/** @example lineStatusLabel("needs-interval-data") // "needs interval data" */
export function lineStatusLabel(s: LineStatus | string): string {
  switch (s) {
    case "exact":
      return "exact";
    case "estimated":
      return "estimated";
    case "needs-interval-data":
      return "needs interval data";
    default:
      return String(s);
  }
}

/**
 * Our plain name for each audit check code of outputs.md: what the check has seen, said the
 * way a colleague would say it. The codes stay stable; only these names are for people.
 */
const CHECK_TITLES: Record<string, string> = {
  "total-mismatch": "Total does not add up under the tariff",
  "line-mismatch": "A charge priced differently from the tariff",
  "unexplained-line": "A charge the tariff has no line for",
  "usage-vs-meter": "Billed use and the meter disagree",
  "demand-vs-meter": "Billed peak and the meter disagree",
  "period-gap": "Days that no bill covers",
  "period-overlap": "Days billed twice by overlapping bills",
  "duplicate-bill": "The same period billed twice",
  "estimated-read": "Bill based on an estimate, not a reading",
  "usage-outlier": "Use the weather does not explain",
  "multiplier-suspect": "Meter multiplier looks wrong",
  "missing-bill": "Metered use with no bill",
  "rate-suspect": "Another rate fits the bill better",
};

/** @example checkTitle("duplicate-bill") // "The same period billed twice" */
export function checkTitle(code: string): string {
  return CHECK_TITLES[code] ?? code;
}
