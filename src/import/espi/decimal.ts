/**
 * Exact decimal arithmetic for ESPI integers: a reading is an integer scaled by a power of ten
 * (powerOfTenMultiplier, unit conversion, 1/100,000 of a currency), so shifting the decimal
 * point of its digits is exact where floating point would round (4702205 Wh → "4702.205" kWh).
 */

/** True when `text` is an optionally signed run of digits. */
export function isIntegerText(text: string): boolean {
  return /^[+-]?\d+$/.test(text);
}

/**
 * The integer `digits` × 10^`power`, as a plain decimal string without exponent or trailing
 * fractional zeros. @example shiftDecimal("4702205", -3) === "4702.205"; shiftDecimal("87", 3) === "87000"
 */
export function shiftDecimal(digits: string, power: number): string {
  let negative = digits.startsWith("-");
  let body = digits.replace(/^[+-]/, "").replace(/^0+(?=\d)/, "");
  if (power >= 0) {
    body = body === "0" ? "0" : body + "0".repeat(power);
  } else {
    const places = -power;
    const padded = body.padStart(places + 1, "0");
    const whole = padded.slice(0, padded.length - places);
    const frac = padded.slice(padded.length - places).replace(/0+$/, "");
    body = frac === "" ? whole : `${whole}.${frac}`;
  }
  if (body === "0") negative = false;
  return negative ? `-${body}` : body;
}

/** A decimal string as a scaled BigInt with `places` fractional digits (for exact sums). */
export function decimalToScaled(text: string, places: number): bigint {
  const m = /^([+-]?)(\d+)(?:\.(\d+))?$/.exec(text);
  if (!m) throw new RangeError(`not a plain decimal: ${text}`);
  const frac = (m[3] ?? "").padEnd(places, "0");
  if (frac.length > places) throw new RangeError(`${text} has more than ${places} decimals`);
  const v = BigInt(m[2] + frac);
  return m[1] === "-" ? -v : v;
}

/** A scaled BigInt back to a decimal string (inverse of decimalToScaled). */
export function scaledToDecimal(value: bigint, places: number): string {
  return shiftDecimal(value.toString(), -places);
}

/** Money from 1/100,000 of the currency, with at least two decimals: "38882000" → "388.82". */
export function moneyFromHundredThousandths(digits: string): string {
  const s = shiftDecimal(digits, -5);
  const [whole, frac = ""] = s.split(".");
  return `${whole}.${frac.padEnd(2, "0")}`;
}
