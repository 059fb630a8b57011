/**
 * Formatting of numbers, money and dates for pages. Pure; fixed locale so builds are
 * reproducible on any machine. Non-finite numbers never reach a page as "NaN": they
 * become the placeholder `NOT_AVAILABLE`.
 */
import { addDays, formatDate as formatCalendarDate, formatMonth } from "../core/time/index.ts";
import { roundCents } from "../core/money.ts";

/** Shown wherever a value is absent or not a finite number. */
export const NOT_AVAILABLE = "—";

/** Locale of every page: fixed so output does not depend on the build machine. */
const LOCALE = "en-US";

// Building an Intl.NumberFormat costs far more than using one; pages format thousands of values.
const formatterCache = new Map<string, Intl.NumberFormat>();

function cachedFormatter(options: Pick<Intl.NumberFormatOptions, "style" | "currency" | "minimumFractionDigits" | "maximumFractionDigits">): Intl.NumberFormat {
  // The key names every option the callers use (a JSON key cost as much as the formatting).
  const key = `${options.style ?? ""}|${options.currency ?? ""}|${options.minimumFractionDigits ?? ""}|${options.maximumFractionDigits ?? ""}`;
  let f = formatterCache.get(key);
  if (!f) {
    f = new Intl.NumberFormat(LOCALE, options);
    formatterCache.set(key, f);
  }
  return f;
}

function moneyFormatter(currency: string, digits: number): Intl.NumberFormat {
  return cachedFormatter({ style: "currency", currency, minimumFractionDigits: digits, maximumFractionDigits: digits });
}

/** Whether Intl accepts `currency` as an ISO 4217 code (it rejects anything not three letters). */
function isCurrencyCode(currency: string): boolean {
  try {
    moneyFormatter(currency, 2);
    return true;
  } catch {
    return false;
  }
}

/**
 * U+2060 WORD JOINER, put between a sign and the currency symbol that follows it. Line breakers
 * treat "−", "+" and "$" alike as prefix characters and may break between them (Chromium does,
 * in a narrow column), which leaves "$4,683.46" at the start of the next line reading as a
 * positive amount. The joiner is invisible and screen readers skip it.
 */
const SIGN_JOINER = "\u2060";

/** A leading minus joined to what follows (Intl puts the currency symbol between it and the digits). */
function joinSign(text: string): string {
  return text.startsWith("-") ? `-${SIGN_JOINER}${text.slice(1)}` : text;
}

/** Formats money; an unusable currency code degrades to "1,234.50 XX" instead of throwing. */
function money(amount: number, currency: string, digits: number): string {
  if (isCurrencyCode(currency)) return joinSign(moneyFormatter(currency, digits).format(amount));
  const n = cachedFormatter({ minimumFractionDigits: digits, maximumFractionDigits: digits }).format(amount);
  return currency ? `${n} ${currency}` : n;
}

/**
 * Money in the portfolio currency (ISO 4217), two decimals.
 * @example formatMoney(1234.5, "USD") // "$1,234.50"
 */
export function formatMoney(amount: number | null | undefined, currency: string): string {
  if (amount == null || !Number.isFinite(amount)) return NOT_AVAILABLE;
  // Rounded by the one money rule first (Intl would round 1.005 down); -0 would print as "-$0.00".
  const rounded = roundCents(amount);
  return money(rounded === 0 ? 0 : rounded, currency, 2);
}

/**
 * Money with an explicit sign, for differences (billed − recomputed); the sign is joined to the
 * amount (SIGN_JOINER) so a line never ends with it.
 * @example formatMoneySigned(4.5, "USD") // "+\u2060$4.50", shown as "+$4.50"
 */
export function formatMoneySigned(amount: number | null | undefined, currency: string): string {
  if (amount == null || !Number.isFinite(amount)) return NOT_AVAILABLE;
  const rounded = roundCents(amount);
  if (rounded === 0) return formatMoney(0, currency);
  return (rounded > 0 ? "+" : "−") + SIGN_JOINER + formatMoney(Math.abs(rounded), currency);
}

/**
 * A per-unit rate with enough decimals to show tariff precision (up to 6).
 * @example formatRate(0.123456, "USD", "kWh") // "$0.123456 per kWh"
 */
export function formatRate(rate: number | null | undefined, currency: string, unit: string): string {
  if (rate == null || !Number.isFinite(rate)) return NOT_AVAILABLE;
  const text = isCurrencyCode(currency)
    ? joinSign(cachedFormatter({ style: "currency", currency, minimumFractionDigits: 2, maximumFractionDigits: 6 }).format(rate))
    : `${cachedFormatter({ minimumFractionDigits: 2, maximumFractionDigits: 6 }).format(rate)} ${currency}`.trim();
  return unit ? `${text} per ${unit}` : text;
}

/**
 * A quantity with thousands separators and at most `maxDigits` decimals.
 * @example formatNumber(1234567.891) // "1,234,568"; formatNumber(12.345, 1) // "12.3"
 */
export function formatNumber(value: number | null | undefined, maxDigits = 0): string {
  if (value == null || !Number.isFinite(value)) return NOT_AVAILABLE;
  const s = cachedFormatter({ maximumFractionDigits: maxDigits }).format(value);
  return s === "-0" ? "0" : s;
}

/**
 * A quantity with its unit; decimals chosen by size so small numbers stay readable.
 * @example formatQuantity(12345.6, "kWh") // "12,346 kWh"; formatQuantity(3.456, "kW") // "3.46 kW"
 */
export function formatQuantity(value: number | null | undefined, unit: string): string {
  if (value == null || !Number.isFinite(value)) return NOT_AVAILABLE;
  const abs = Math.abs(value);
  const digits = abs >= 1000 ? 0 : abs >= 100 ? 1 : abs >= 1 ? 2 : 4;
  const n = formatNumber(value, digits);
  return unit ? `${n} ${unit}` : n;
}

/**
 * Percentage from a fraction.
 * @example formatPercent(0.256) // "25.6%"
 */
export function formatPercent(fraction: number | null | undefined, digits = 1): string {
  if (fraction == null || !Number.isFinite(fraction)) return NOT_AVAILABLE;
  return cachedFormatter({ style: "percent", maximumFractionDigits: digits }).format(fraction);
}

/**
 * A calendar date as people read it, or "—" when there is none.
 * @example formatDate("2025-01-31") // "Jan 31, 2025"
 */
export function formatDate(isoDate: string | null | undefined): string {
  return isoDate ? formatCalendarDate(isoDate) : NOT_AVAILABLE;
}

export { formatMonth };

/**
 * A half-open service period [start, end) shown with its last day of service, inclusive.
 * @example formatPeriod("2025-01-01", "2025-02-01") // "Jan 1, 2025 – Jan 31, 2025"
 */
export function formatPeriod(periodStart: string, periodEnd: string): string {
  const lastDay = addDays(periodEnd, -1);
  return `${formatDate(periodStart)} – ${formatDate(lastDay)}`;
}

/**
 * Serializes a value as JSON for a `<script type="application/json">` block: `<` becomes
 * `\u003c` so no `</script>` or `<!--` inside a string can end the block early.
 */
export function jsonForScript(value: unknown): string {
  return scriptSafeJson(JSON.stringify(value));
}

/**
 * JSON text made safe for a `<script type="application/json">` block as jsonForScript makes it:
 * `<`, U+2028 and U+2029 written as escapes (the text means the same JSON).
 * @example scriptSafeJson('{"a":"</script>"}') // '{"a":"\\u003c/script>"}'
 */
export function scriptSafeJson(json: string): string {
  return json
    .replace(/</g, "\\u003c")
    .replace(/\u2028/g, "\\u2028")
    .replace(/\u2029/g, "\\u2029");
}
