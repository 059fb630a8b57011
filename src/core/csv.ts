/**
 * RFC 4180 CSV writing for the files a build publishes — the one place every CSV cell goes
 * through. Fields containing a comma, quote, CR or LF are quoted and quotes doubled;
 * null/undefined become empty cells; non-finite numbers become empty cells.
 *
 * Safe to open in a spreadsheet: a text cell starting with `=`, `+`, `-`, `@`, tab (0x09) or
 * CR (0x0D) would be run as a formula (`=HYPERLINK(…)` in a bill id, `@SUM(…)` in a meter id), so
 * it gets a leading single quote `'`, which spreadsheets show as text — the mitigation in
 * OWASP's "CSV Injection" guidance (owasp.org/www-community/attacks/CSV_Injection). Numbers are
 * never touched: a JavaScript number, or text that is a plain decimal number such as `-12.50`
 * or `+3`, is written as is, so negative money amounts stay numbers.
 */
export type CsvCell = string | number | boolean | null | undefined;

/** The characters OWASP lists as starting a formula (or a DDE payload) in a spreadsheet cell. */
const FORMULA_START = /^[=+\-@\t\r]/;

/** A plain decimal number (optional sign, digits, optional fraction and exponent). */
const NUMERIC = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * Neutralises a text cell a spreadsheet would evaluate (OWASP CSV injection guidance): prefixes
 * `'` when it starts with `=`, `+`, `-`, `@`, tab or CR and is not a plain number.
 * @example neutraliseFormula("=1+2") === "'=1+2"; neutraliseFormula("-12.50") === "-12.50"
 */
export function neutraliseFormula(text: string): string {
  return FORMULA_START.test(text) && !NUMERIC.test(text) ? `'${text}` : text;
}

/** One field: formula-neutralised when text, quoted when RFC 4180 requires it. */
export function csvField(value: CsvCell): string {
  if (value === null || value === undefined) return "";
  const text =
    typeof value === "number" ? (Number.isFinite(value) ? String(value) : "") : typeof value === "boolean" ? String(value) : neutraliseFormula(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * Serialises rows under a fixed header; columns not present in a row are empty.
 * `eol` is "\n" by default; pass "\r\n" for the RFC 4180 line break.
 * @example toCsv(["a","b"], [{a: 1, b: "x,y"}]) === 'a,b\n1,"x,y"\n'
 */
export function toCsv<Row extends object>(columns: readonly (keyof Row & string)[], rows: readonly Row[], eol: "\n" | "\r\n" = "\n"): string {
  const lines = [columns.map(csvField).join(",")];
  for (const row of rows) lines.push(columns.map((c) => csvField(row[c] as CsvCell)).join(","));
  return lines.join(eol) + eol;
}
