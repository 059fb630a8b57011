/** Minimal RFC 4180 writing and exact number formatting for the demo's CSV files. */

/** Quotes a cell when it holds a comma, quote or line break (RFC 4180 §2). */
export function csvCell(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return "";
  const s = String(value);
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** One CSV document: header + rows, `\n` line ends, trailing newline. */
export function csvText(header: string[], rows: (string | number | null | undefined)[][]): string {
  return [header.join(","), ...rows.map((r) => r.map(csvCell).join(","))].join("\n") + "\n";
}

/**
 * Fixed-point text without a negative zero (`-0.0` would look like a data error).
 * @example fixed(-0.04, 1) // "0.0"
 */
export function fixed(value: number, decimals: number): string {
  const s = value.toFixed(decimals);
  return /^-0\.?0*$/.test(s) ? s.slice(1) : s;
}

/**
 * Exact decimal text of an integer count of 10^-decimals units, trailing zeros trimmed.
 * Interval values are kept as such integers so sums and products stay exact.
 * @example scaledIntText(123450, 3) // "123.45"
 */
export function scaledIntText(count: number, decimals: number): string {
  if (!Number.isSafeInteger(count)) throw new Error(`demo: not a safe integer: ${count}`);
  const negative = count < 0;
  const digits = String(Math.abs(count)).padStart(decimals + 1, "0");
  const whole = decimals === 0 ? digits : digits.slice(0, -decimals);
  const frac = decimals === 0 ? "" : digits.slice(-decimals).replace(/0+$/, "");
  const text = frac ? `${whole}.${frac}` : whole;
  return negative && text !== "0" ? `-${text}` : text;
}

/** Money with two decimals. */
export function money(amount: number): string {
  return fixed(amount, 2);
}
