/** Number formatting for finding messages (plain text, deterministic, no locale lookups). */

function groupThousands(digits: string): string {
  return digits.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
}

/**
 * A quantity with up to `decimals` decimals (trailing zeros dropped), thousands grouped.
 * @example formatQty(12345.678, 1) // "12,345.7"
 */
export function formatQty(value: number, decimals = 2): string {
  const fixed = Math.abs(value).toFixed(decimals).replace(/\.?0+$/, "");
  const [whole, frac] = fixed.split(".");
  return `${value < 0 ? "-" : ""}${groupThousands(whole)}${frac ? "." + frac : ""}`;
}

/** Percent with one decimal. @example formatPct(0.1234) // "12.3 %" */
export function formatPct(fraction: number): string {
  return `${(fraction * 100).toFixed(1)} %`;
}
