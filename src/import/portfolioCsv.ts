/**
 * Reading and appending rows of the portfolio's small CSV files (buildings, meters, bills,
 * bill_lines) for importers: rows are appended under the file's own header order, so a user's
 * column order and extra columns are kept.
 */
import { existsSync } from "node:fs";
import { readFile, rename, writeFile } from "node:fs/promises";
import { parse } from "csv-parse/sync";
import { csvField } from "../core/csv.ts";

export interface CsvTable {
  path: string;
  exists: boolean;
  /** Column names in file order, lower-cased. */
  header: string[];
  /** Rows keyed by lower-cased column name, with their 1-based line. */
  rows: { cells: Record<string, string>; line: number }[];
  /** Text as read (empty when the file does not exist). */
  text: string;
}

/**
 * Reads `path`; a missing file gives an empty table with `defaultHeader`.
 * @throws Error with the parser's message when the file is not valid CSV
 */
export async function readCsvTable(path: string, defaultHeader: readonly string[]): Promise<CsvTable> {
  if (!existsSync(path)) return { path, exists: false, header: [...defaultHeader], rows: [], text: "" };
  const text = await readFile(path, "utf8");
  const records = parse(text, { bom: true, skip_empty_lines: true, relax_column_count: true, info: true }) as unknown as { record: string[]; info: { lines: number } }[];
  if (records.length === 0) return { path, exists: true, header: [...defaultHeader], rows: [], text: "" };
  const header = records[0]!.record.map((h) => h.trim().toLowerCase());
  const rows = records.slice(1).map(({ record, info }) => {
    const cells: Record<string, string> = {};
    header.forEach((h, i) => (cells[h] = (record[i] ?? "").trim()));
    return { cells, line: info.lines };
  });
  return { path, exists: true, header, rows, text };
}

/**
 * The table's text with `rows` appended under its header (columns it lacks are dropped and
 * returned, so the caller can warn). Does not write.
 */
export function appendRows(table: CsvTable, rows: readonly Record<string, string>[]): { text: string; dropped: string[] } {
  const dropped = new Set<string>();
  for (const row of rows) for (const [k, v] of Object.entries(row)) if (v !== "" && !table.header.includes(k)) dropped.add(k);
  let text = table.text;
  if (text === "") text = `${table.header.join(",")}\n`;
  else if (!text.endsWith("\n")) text += "\n";
  for (const row of rows) text += `${table.header.map((h) => csvField(row[h] ?? "")).join(",")}\n`;
  return { text, dropped: [...dropped] };
}

/** Replaces `path` with `text` through a temporary file and a rename. */
export async function replaceFile(path: string, text: string): Promise<void> {
  const tmp = `${path}.ohmbook-tmp-${process.pid}`;
  await writeFile(tmp, text);
  await rename(tmp, path);
}
