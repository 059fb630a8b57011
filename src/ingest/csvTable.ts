/**
 * Streaming reader for the small CSV files (buildings, meters, bills, bill lines, weather):
 * RFC 4180 via csv-parse, BOM tolerated, header required, column names matched
 * case-insensitively in any order, unknown columns warned once, empty cell = missing.
 * Rows are handed one at a time to a callback with strict typed accessors.
 */
import { createReadStream } from "node:fs";
import { access } from "node:fs/promises";
import { parse } from "csv-parse";
import { FileContext } from "./fileContext.ts";
import { parseIsoDate, parseStrictNumber } from "./fields.ts";

export interface TableSpec {
  required: readonly string[];
  optional: readonly string[];
}

/**
 * Accessors for one data row. The first problem found rejects the row (counted once);
 * further problems in the same row are still reported, so a user can fix them all at once.
 */
export class Row {
  /** True once any accessor found a problem. */
  failed = false;

  constructor(
    readonly line: number,
    private readonly cells: readonly string[],
    private readonly columns: ReadonlyMap<string, number>,
    private readonly ctx: FileContext,
  ) {}

  /** 1-based column of `name` in this file (0 when absent). */
  column(name: string): number {
    const i = this.columns.get(name);
    return i === undefined ? 0 : i + 1;
  }

  /** Reports a problem at `name`'s column. */
  problem(name: string, message: string, hint?: string): void {
    if (this.failed) this.ctx.error(this.line, this.column(name), message, hint);
    else this.ctx.reject(this.line, this.column(name), message, hint);
    this.failed = true;
  }

  /** The cell exactly as written, or null when absent or blank. */
  raw(name: string): string | null {
    const i = this.columns.get(name);
    if (i === undefined) return null;
    const v = this.cells[i];
    return v === undefined || v.trim() === "" ? null : v;
  }

  /** Trimmed text; a missing required value is a problem. */
  text(name: string, required: boolean): string | null {
    const v = this.raw(name);
    if (v === null) {
      if (required) this.problem(name, `${name} is empty`, `every row needs a ${name}`);
      return null;
    }
    return v.trim();
  }

  /** Strict decimal number (see parseStrictNumber); `check` adds a range rule. */
  number(name: string, required: boolean, check?: (v: number) => string | null): number | null {
    const v = this.text(name, required);
    if (v === null) return null;
    const parsed = parseStrictNumber(v, name);
    if (!parsed.ok) {
      this.problem(name, parsed.problem.message, parsed.problem.hint);
      return null;
    }
    const rule = check?.(parsed.value);
    if (rule) {
      this.problem(name, `${name} ${v} ${rule}`, `correct the value: ${name} ${rule}`);
      return null;
    }
    return parsed.value;
  }

  /** Strict `YYYY-MM-DD`. */
  date(name: string, required: boolean): string | null {
    const v = this.text(name, required);
    if (v === null) return null;
    const parsed = parseIsoDate(v, name);
    if (!parsed.ok) {
      this.problem(name, parsed.problem.message, parsed.problem.hint);
      return null;
    }
    return parsed.value;
  }

  /** One of `allowed` (matched case-insensitively, returned in the listed spelling). */
  choice<T extends string>(name: string, allowed: readonly T[], fallback: T | null): T | null {
    const v = this.text(name, fallback === null);
    if (v === null) return fallback;
    const found = allowed.find((a) => a.toLowerCase() === v.toLowerCase());
    if (found === undefined) {
      this.problem(name, `${name} ${JSON.stringify(v)} is not one of ${allowed.join(", ")}`, `write one of: ${allowed.join(", ")}`);
      return null;
    }
    return found;
  }
}

export interface TableResult {
  /** The file does not exist. */
  notFound: boolean;
  /** Required columns absent from the header (the file was not read), else empty. */
  missingColumns: string[];
}

const countNewlines = (cells: readonly string[]): number => {
  let n = 0;
  for (const c of cells) for (let i = c.indexOf("\n"); i !== -1; i = c.indexOf("\n", i + 1)) n++;
  return n;
};

/**
 * Reads `path` row by row into `onRow`, reporting into `ctx` (label = ctx.file).
 * Blank lines are skipped and not counted. A malformed quote stops the file with an error
 * at its line. Example: `await readCsvTable(p, ctx, { required: ["meter_id"], optional: [] }, (row) => ...)`.
 */
export async function readCsvTable(path: string, ctx: FileContext, spec: TableSpec, onRow: (row: Row) => void): Promise<TableResult> {
  try {
    await access(path);
  } catch {
    return { notFound: true, missingColumns: [] };
  }
  const parser = createReadStream(path).pipe(
    // relax_quotes: a quote inside an unquoted cell (`He said "hi"`) is kept as text, not an error.
    parse({ bom: true, relax_column_count: true, relax_quotes: true, info: true, skip_empty_lines: true }),
  );
  let columns: Map<string, number> | null = null;
  let width = 0;
  let aborted = false;
  try {
    for await (const rec of parser as AsyncIterable<{ record: string[]; info: { lines: number } }>) {
      const line = rec.info.lines - countNewlines(rec.record);
      if (columns === null) {
        const names = rec.record.map((n) => n.trim().toLowerCase());
        columns = new Map();
        width = names.length;
        names.forEach((n, i) => {
          if (columns!.has(n)) ctx.warn(line, i + 1, `column ${n} appears twice; the first one is used`, "remove the repeated column");
          else columns!.set(n, i);
        });
        const missing = spec.required.filter((c) => !columns!.has(c));
        if (missing.length > 0) {
          ctx.error(line, 0, `missing required column(s): ${missing.join(", ")}`,
            `the header must name: ${spec.required.join(", ")} (any order, any case)`);
          parser.destroy();
          return { notFound: false, missingColumns: missing };
        }
        const known = new Set([...spec.required, ...spec.optional]);
        const unknown = names.filter((n) => n !== "" && !known.has(n));
        if (unknown.length > 0) {
          ctx.warn(line, names.indexOf(unknown[0]) + 1, `unknown column(s) ignored: ${unknown.join(", ")}`,
            `known columns: ${[...spec.required, ...spec.optional].join(", ")}`);
        }
        continue;
      }
      ctx.report.rowsRead++;
      if (rec.record.length > width) {
        ctx.reject(line, width + 1, `row has ${rec.record.length} fields, the header has ${width}`,
          'check for a stray comma; quote text that contains commas ("a, b")');
        continue;
      }
      const row = new Row(line, rec.record, columns, ctx);
      onRow(row);
      // A row is used unless a check rejected it: handlers only report problems.
      if (!row.failed) ctx.use();
    }
  } catch (err) {
    aborted = true;
    const e = err as { message?: string; lines?: number };
    ctx.error(e.lines ?? 0, 0, `cannot read the rest of the file: ${e.message ?? String(err)}`,
      'check quoting: a quoted cell must end with a quote, and quotes inside it are doubled ("")');
  }
  if (columns === null) {
    if (!aborted) ctx.error(0, 0, "file is empty (no header row)", `add a header naming: ${spec.required.join(", ")}`);
    return { notFound: false, missingColumns: [...spec.required] };
  }
  return { notFound: false, missingColumns: [] };
}
