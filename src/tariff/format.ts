/**
 * Fast number text for line notes ("1,583.3333 × 0.238"). Intl's toLocaleString costs more than
 * pricing a whole bill, so grouping is done by hand.
 *
 * @example groupedNumber(1583.333333, 4) // "1,583.3333"
 */
export function groupedNumber(n: number, maxDigits = 4): string {
  const s = String(Number(n.toFixed(maxDigits)));
  if (s.includes("e")) return s;
  const neg = s.startsWith("-");
  const body = neg ? s.slice(1) : s;
  const dot = body.indexOf(".");
  const int = dot < 0 ? body : body.slice(0, dot);
  const frac = dot < 0 ? "" : body.slice(dot);
  const grouped = int.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  return `${neg ? "-" : ""}${grouped}${frac}`;
}
