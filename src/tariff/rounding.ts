/**
 * Rounds an amount to the cent, halves away from zero ("half-up" as bills print it).
 * Binary floating point stores 1.005 as 1.00499999…, so the value is first cleaned to
 * 12 significant digits; amounts of bills never need more.
 *
 * @example roundCents(1.005) // 1.01
 * @example roundCents(-2.345) // -2.35
 */
export function roundCents(amount: number): number {
  if (!Number.isFinite(amount)) return amount;
  const cents = Number((Math.abs(amount) * 100).toPrecision(12));
  const rounded = Math.floor(cents + 0.5) / 100;
  return amount < 0 ? -rounded : rounded === 0 ? 0 : rounded;
}

/**
 * Sum of amounts with Neumaier compensation, so a long list of cents adds up exactly as
 * a person would add them.
 */
export function sumAmounts(values: readonly number[]): number {
  let sum = 0;
  let c = 0;
  for (const v of values) {
    const t = sum + v;
    c += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
    sum = t;
  }
  return sum + c;
}
