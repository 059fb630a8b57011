/**
 * RFC 4180 CSV writing for the files a build publishes. Fields containing a comma, quote,
 * CR or LF are quoted and quotes doubled; null/undefined become empty cells.
 */
export type CsvCell = string | number | boolean | null | undefined;

/** Quotes one field when RFC 4180 requires it. */
export function csvField(value: CsvCell): string {
  if (value === null || value === undefined) return "";
  const text = typeof value === "number" ? (Number.isFinite(value) ? String(value) : "") : String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * Serialises rows under a fixed header; columns not present in a row are empty.
 * @example toCsv(["a","b"], [{a: 1, b: "x,y"}]) === 'a,b\n1,"x,y"\n'
 */
export function toCsv<Row extends object>(columns: readonly (keyof Row & string)[], rows: readonly Row[]): string {
  const lines = [columns.map(csvField).join(",")];
  for (const row of rows) lines.push(columns.map((c) => csvField(row[c] as CsvCell)).join(","));
  return lines.join("\n") + "\n";
}
