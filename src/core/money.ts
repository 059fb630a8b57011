/**
 * Money: the one rounding rule (to the cent, halves away from zero, as bills print it), exact
 * sums, and money as plain text for messages, the CLI and data files. Pages format money for
 * people with src/report/format.ts's `formatMoney`, which rounds through `roundCents` first.
 */

/**
 * Rounds an amount to the cent, halves away from zero ("half-up" as bills print it).
 * Binary floating point stores 1.005 as 1.00499999…, so the cents are first cleaned to 15
 * significant digits (the most a double holds exactly, DBL_DIG): enough for amounts up to a
 * billion with cents to spare (12 digits were not: 421,696,373.6845 rounded up).
 *
 * @example roundCents(1.005) // 1.01
 * @example roundCents(-2.345) // -2.35
 */
export function roundCents(amount: number): number {
  if (!Number.isFinite(amount)) return amount;
  const x = Math.abs(amount) * 100;
  const below = Math.floor(x);
  const fraction = x - below; // exact
  // Cleaning to 15 digits moves x by at most 5e-7 below a billion cents, so it can change the
  // result only within that of a half cent: elsewhere skip toPrecision, the costly part when a
  // forecast prices hundreds of thousands of lines (test/core/money.test.ts checks both agree).
  const whole = x < 1e9 && Math.abs(fraction - 0.5) > 1e-5 ? (fraction < 0.5 ? below : below + 1) : Math.floor(Number(x.toPrecision(15)) + 0.5);
  const rounded = whole / 100;
  return amount < 0 ? -rounded : rounded === 0 ? 0 : rounded;
}

/**
 * Sum of amounts with Neumaier compensation, so a long list of cents adds up exactly as
 * a person would add them.
 */
export function sumAmounts(values: readonly number[]): number {
  const acc = new Compensated();
  for (const v of values) acc.add(v);
  return acc.total();
}

/**
 * {@link sumAmounts} one value at a time (the same Neumaier steps in the same order): `total()`
 * is the number sumAmounts gives for the values added since `reset()`, without an array.
 */
export class Compensated {
  private sum = 0;
  private c = 0;
  count = 0;
  reset(): this {
    this.sum = 0;
    this.c = 0;
    this.count = 0;
    return this;
  }
  add(v: number): void {
    const sum = this.sum;
    const t = sum + v;
    this.c += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
    this.sum = t;
    this.count++;
  }
  total(): number {
    return this.sum + this.c;
  }
}

/** An amount rounded to the cent as a whole number of cents. @example toCents(-2.345) // -235 */
export function toCents(amount: number): number {
  return Math.round(roundCents(amount) * 100);
}

/**
 * Money for data files (CSV, JSON text cells): rounded to the cent, two decimals, no grouping.
 * @example moneyCell(1.005) // "1.01"
 */
export function moneyCell(amount: number): string {
  return roundCents(amount).toFixed(2);
}

/**
 * Money in plain text for messages and the terminal: rounded to the cent, thousands grouped,
 * the currency code after when given.
 * @example moneyText(-1234.5, "USD") // "-1,234.50 USD"
 * @example moneyText(1234.5) // "1,234.50"
 */
export function moneyText(amount: number, currency?: string): string {
  const rounded = roundCents(amount);
  const sign = rounded < 0 ? "-" : "";
  const [whole, cents] = Math.abs(rounded).toFixed(2).split(".");
  const text = `${sign}${whole!.replace(/\B(?=(\d{3})+(?!\d))/g, ",")}.${cents}`;
  return currency ? `${text} ${currency}` : text;
}
