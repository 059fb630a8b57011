/**
 * Plausibility limits checked at ingest, each with its reason, so that a portfolio `check`
 * accepts is one `build` can price, model and publish: every number stays finite through
 * the arithmetic downstream, every date is one the time-zone library handles, and every id
 * fits in a page file name. docs/inputs.md, "Limits", lists the same values.
 */

/**
 * Largest |usage| on a bill, in the meter's unit: 1e12. The largest single sites use about
 * 1e10 kWh a year; a thousand times more is a typing error, and keeping usage below 1e12 with
 * rates below 1e9 (tariff limit) keeps every priced line finite and cents exact.
 */
export const MAX_BILL_USAGE = 1e12;

/** Largest billed demand, kW: 1e7 (10 GW, above the largest single-site loads on any grid). */
export const MAX_DEMAND_KW = 1e7;

/**
 * Largest |total| of a bill, in the portfolio currency: 1e11. Doubles hold cents exactly up to
 * about 9e13; 1e11 leaves room to add up thousands of bills without losing a cent.
 */
export const MAX_BILL_TOTAL = 1e11;

/**
 * Longest bill period, days: 400. Bills cover a month, a quarter or at most a year; a longer
 * period (e.g. 100 years) is a typed date, and would spread usage over decades of weather.
 */
export const MAX_BILL_DAYS = 400;

/**
 * Dates and timestamps must fall in the years 1900–2199. Utility data from before 1900 does
 * not exist in this form, time-zone rules are undefined there, and year 0000 or 9999 is a
 * spreadsheet artefact; the upper bound leaves room for long forecasts.
 */
export const MIN_YEAR = 1900;
export const MAX_YEAR = 2199;

/**
 * Largest |value| of one interval reading, in the meter's unit: 1e9 (a 5-minute reading of
 * 1e9 kWh is 12 TW: no meter measures that). Sums over a year of readings then stay finite.
 */
export const MAX_INTERVAL_VALUE = 1e9;

/** Largest floor area, ft² or m²: 1e8 (the largest buildings are about 2e7 ft²). */
export const MAX_FLOOR_AREA = 1e8;

/** Largest meter multiplier (CT/PT ratio): 1e6 (real ratios reach tens of thousands). */
export const MAX_MULTIPLIER = 1e6;

/**
 * Longest id, in UTF-8 bytes: 100. Ids become page and folder names (`buildings/<id>/…`), and
 * file systems cap a name at 255 bytes; 100 leaves room for the prefixes and suffixes a page
 * adds. A 300-character building id made every page fail to write (issue 16).
 */
const MAX_ID_BYTES = 100;

/** Longest bill id, UTF-8 bytes: 200 (bill ids appear in downloads, not in file names). */
export const MAX_BILL_ID_BYTES = 200;

/** UTF-8 length of `text` in bytes. */
function utf8Bytes(text: string): number {
  return Buffer.byteLength(text, "utf8");
}

/** Reason an id is too long (in bytes, or for a page file name), or null when it fits. */
export function idLengthProblem(name: string, id: string, maxBytes: number = MAX_ID_BYTES): string | null {
  const bytes = utf8Bytes(id);
  if (bytes > maxBytes) return `${name} is ${bytes} bytes long; at most ${maxBytes} are allowed`;
  const page = pageNameLength(id);
  if (maxBytes === MAX_ID_BYTES && page > MAX_PAGE_NAME_CHARS) {
    return `${name} would make a page file name of ${page} characters (each character other than letters, digits, _ and - takes several); at most ${MAX_PAGE_NAME_CHARS}`;
  }
  return null;
}

/**
 * Longest page file name an id may produce, in characters: 200. Pages escape every character
 * other than letters, digits, `_` and `-` as `~` plus its code point in hex (src/report/nav.ts
 * `fileSafe`), so `@` costs 3 characters and an emoji 6; 200 plus ".html" stays under 255.
 */
export const MAX_PAGE_NAME_CHARS = 200;

/** Length of `id` once escaped for a file name (the same rule as the site's `fileSafe`). */
export function pageNameLength(id: string): number {
  let n = 0;
  for (const ch of id) n += /^[A-Za-z0-9_-]$/.test(ch) ? 1 : 1 + ch.codePointAt(0)!.toString(16).length;
  return n;
}

/** A limit as people write it: 1e11, 1e9, 400. */
export function limitText(n: number): string {
  return n >= 1e6 ? n.toExponential().replace("e+", "e") : String(n);
}

/** Rule for Row.number: |v| ≤ max. */
export const withinMagnitude = (max: number) => (v: number): string | null => (Math.abs(v) <= max ? null : `is beyond ±${limitText(max)}`);
