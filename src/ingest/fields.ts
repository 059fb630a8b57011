/**
 * Strict cell parsers shared by every ingest reader. Each returns either a value or a
 * problem (message + hint); none of them coerces silently (`Number("")` is 0,
 * `parseFloat("12abc")` is 12 — both are exactly what we must not do).
 */

export interface FieldProblem {
  message: string;
  hint: string;
}

export type Parsed<T> = { ok: true; value: T } | { ok: false; problem: FieldProblem };

import { quoteValue } from "../core/issues.ts";
import { MAX_YEAR, MIN_YEAR } from "./limits.ts";

const ok = <T>(value: T): Parsed<T> => ({ ok: true, value });
const bad = (message: string, hint: string): Parsed<never> => ({ ok: false, problem: { message, hint } });

// Written so each digit can match in only one way: `\d+\.?\d*` lets a long run of digits be
// split between the two groups in n ways, and a 10-million-digit cell then never finishes.
const NUMBER_RE = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * Explains why `text` is not a plain decimal number, naming the usual spreadsheet culprits.
 * Exported so the fast interval parser gives the same wording as the CSV readers.
 */
export function numberProblem(text: string, what: string): FieldProblem {
  const shown = quoteValue(text);
  if (/^[+-]?\d{1,3}(,\d{3})+(\.\d+)?$/.test(text)) {
    return {
      message: `${what} ${shown} has a thousands separator`,
      hint: `write plain digits with "." as decimal point, e.g. ${text.replace(/,/g, "")}`,
    };
  }
  if (/^[+-]?\d+,\d+$/.test(text)) {
    return {
      message: `${what} ${shown} uses a comma as decimal point`,
      hint: `use "." as decimal point, e.g. ${text.replace(",", ".")}`,
    };
  }
  if (/[$€£¥]/.test(text)) {
    return {
      message: `${what} ${shown} contains a currency symbol`,
      hint: "write only the number; the currency is set once in portfolio.yaml",
    };
  }
  if (/%/.test(text)) {
    return { message: `${what} ${shown} contains "%"`, hint: "write only the number" };
  }
  if (/^[+-]?(nan|inf|infinity)$/i.test(text)) {
    return { message: `${what} ${shown} is not a finite number`, hint: "leave the cell empty when the value is missing" };
  }
  return {
    message: `${what} ${shown} is not a number`,
    hint: 'use digits with an optional "-" and "." decimal point, e.g. 1234.5',
  };
}

/**
 * Parses a decimal number strictly: optional sign, digits, optional `.` fraction and
 * exponent. Rejects thousands separators, currency symbols, trailing text, NaN, Infinity.
 * Surrounding spaces are ignored. Example: `parseStrictNumber("12.5", "usage")` → 12.5;
 * `parseStrictNumber("1,234", "usage")` → problem with a hint.
 */
export function parseStrictNumber(raw: string, what: string): Parsed<number> {
  const text = raw.trim();
  if (!NUMBER_RE.test(text)) {
    const p = numberProblem(text, what);
    return bad(p.message, p.hint);
  }
  const value = Number(text);
  if (!Number.isFinite(value)) return bad(`${what} ${quoteValue(text)} is out of range`, "check the number of digits");
  return ok(value);
}

/** Days in a month of the proleptic Gregorian calendar (month 1–12). */
export function daysInMonth(year: number, month: number): number {
  if (month === 2) return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0 ? 29 : 28;
  return month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31;
}

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;

/**
 * Validates an ISO 8601 calendar date `YYYY-MM-DD` (no other spellings) and returns it unchanged.
 * Example: "2024-02-29" ok; "2023-02-29", "2024-2-1", "01/02/2024" rejected.
 */
export function parseIsoDate(raw: string, what: string): Parsed<string> {
  const text = raw.trim();
  const m = DATE_RE.exec(text);
  if (!m) {
    return bad(`${what} ${quoteValue(text)} is not a date in YYYY-MM-DD form`, "write dates as ISO 8601, e.g. 2024-03-31");
  }
  const y = Number(m[1]);
  const mo = Number(m[2]);
  const d = Number(m[3]);
  if (mo < 1 || mo > 12 || d < 1 || d > daysInMonth(y, mo)) {
    return bad(`${what} ${quoteValue(text)} is not a real calendar day`, "check month and day");
  }
  if (y < MIN_YEAR || y > MAX_YEAR) {
    return bad(`${what} ${quoteValue(text)} is outside the years ${MIN_YEAR}–${MAX_YEAR}`, "check the year; spreadsheets write 0000 or 9999 for empty dates");
  }
  return ok(text);
}

/** Whole days from 1970-01-01 to the given civil date (Hinnant's days_from_civil). */
export function daysFromCivil(y: number, m: number, d: number): number {
  y -= m <= 2 ? 1 : 0;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (m + (m > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

