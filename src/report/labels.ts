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

/** Titles for the audit check codes of outputs.md. */
const CHECK_TITLES: Record<string, string> = {
  "total-mismatch": "Bill total differs from the tariff",
  "line-mismatch": "A printed charge differs from the tariff",
  "unexplained-line": "A printed charge the tariff does not explain",
  "usage-vs-meter": "Billed usage differs from the interval meter",
  "demand-vs-meter": "Billed demand differs from the interval meter",
  "period-gap": "Gap between billing periods",
  "period-overlap": "Overlapping billing periods",
  "duplicate-bill": "Possible duplicate bill",
  "estimated-read": "Estimated meter read",
  "usage-outlier": "Usage outside what the weather explains",
  "multiplier-suspect": "Possible meter multiplier error",
  "missing-bill": "Missing bill",
  "rate-suspect": "Bill may be on the wrong rate",
};

/** @example checkTitle("duplicate-bill") // "Possible duplicate bill" */
export function checkTitle(code: string): string {
  return CHECK_TITLES[code] ?? code;
}
