/**
 * Streaming reader for the small CSV files (buildings, meters, bills, bill lines, weather):
 * RFC 4180 (csvRecords.ts: any line ending, a stray quote costs only its own row), BOM
 * tolerated, header required, column names matched case-insensitively in any order, unknown
 * columns warned once, empty cell = missing. Only regular files inside the portfolio folder
 * are read (inputFile.ts). Rows are handed one at a time to a callback with strict accessors.
 */
import { realpath } from "node:fs/promises";
import { dirname } from "node:path";
import { quoteValue } from "../core/issues.ts";
import { FileContext } from "./fileContext.ts";
import { csvRecords, physicalLines } from "./csvRecords.ts";
import { parseIsoDate, parseStrictNumber } from "./fields.ts";
import { describeFsError, NOT_UTF8_HINT, NOT_UTF8_MESSAGE, openInputFile } from "./inputFile.ts";
import { trimId } from "../core/trimId.ts";

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
    return v === undefined || trimId(v) === "" ? null : v;
  }

  /** Text trimmed of every kind of whitespace (trimId, the rule for ids); a missing required value is a problem. */
  text(name: string, required: boolean): string | null {
    const v = this.raw(name);
    if (v === null) {
      if (required) this.problem(name, `${name} is empty`, `every row needs a ${name}`);
      return null;
    }
    return trimId(v);
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
      this.problem(name, `${name} ${v.length > 40 ? quoteValue(v) : v} ${rule}`, `correct the value: ${name} ${rule}`);
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
      this.problem(name, `${name} ${quoteValue(v)} is not one of ${allowed.join(", ")}`, `write one of: ${allowed.join(", ")}`);
      return null;
    }
    return found;
  }
}

export interface TableResult {
  /** The file does not exist. */
  notFound: boolean;
  /** Required columns absent from the header, or the file could not be read at all, else empty. */
  missingColumns: string[];
  /** The file exists but is not a readable regular file inside the portfolio folder (reported). */
  unreadable?: boolean;
}

/**
 * Reads `path` row by row into `onRow`, reporting into `ctx` (label = ctx.file).
 * Blank lines are skipped and not counted. A malformed quote rejects the row where it opens;
 * the rows after it are still read. A directory, FIFO, device, unreadable file or a symbolic
 * link leading outside the portfolio folder is reported as an error at `file:0:0`.
 * Example: `await readCsvTable(p, ctx, { required: ["meter_id"], optional: [] }, (row) => ...)`.
 */
export async function readCsvTable(path: string, ctx: FileContext, spec: TableSpec, onRow: (row: Row) => void): Promise<TableResult> {
  const rootReal = ctx.rootReal ?? (await realpath(dirname(path)).catch(() => dirname(path)));
  const opened = await openInputFile(rootReal, path);
  if (!opened.ok) {
    if (opened.missing) return { notFound: true, missingColumns: [] };
    ctx.error(0, 0, opened.message, opened.hint);
    return { notFound: false, missingColumns: [...spec.required], unreadable: true };
  }
  let columns: Map<string, number> | null = null;
  let width = 0;
  let warnedEncoding = false;
  let aborted = false;
  try {
    const records = csvRecords(physicalLines(opened.handle.createReadStream({ highWaterMark: 1 << 16, autoClose: false })), () => (columns === null ? Infinity : width));
    for await (const rec of records) {
      if (columns === null) {
        if (rec.fields === null) {
          ctx.error(rec.line, rec.error?.column ?? 0, `header row: ${rec.error?.message ?? "cannot be read"}`, "the first line must name the columns, separated by commas");
          return { notFound: false, missingColumns: [...spec.required], unreadable: true };
        }
        const names = rec.fields.map((n, i) => (i === 0 ? n.replace(/^\uFEFF/, "") : n).trim().toLowerCase());
        columns = new Map();
        width = names.length;
        names.forEach((n, i) => {
          if (columns!.has(n)) ctx.warn(rec.line, i + 1, `column ${quoteValue(n)} appears twice; the first one is used`, "remove the repeated column");
          else columns!.set(n, i);
        });
        const missing = spec.required.filter((c) => !columns!.has(c));
        if (missing.length > 0) {
          ctx.error(rec.line, 0, `missing required column(s): ${missing.join(", ")}`,
            `the header must name: ${spec.required.join(", ")} (any order, any case)`);
          return { notFound: false, missingColumns: missing };
        }
        const known = new Set<string>([...spec.required, ...spec.optional]);
        const unknown = names.filter((n) => n !== "" && !known.has(n));
        if (unknown.length > 0) {
          ctx.warn(rec.line, names.indexOf(unknown[0]) + 1, `unknown column(s) ignored: ${unknown.slice(0, 10).map((u) => quoteValue(u)).join(", ")}${unknown.length > 10 ? ` and ${unknown.length - 10} more` : ""}`,
            `known columns: ${[...spec.required, ...spec.optional].join(", ")}`);
        }
        continue;
      }
      ctx.report.rowsRead++;
      if (rec.fields === null) {
        ctx.reject(rec.line, rec.error?.column ?? 0, rec.error?.message ?? "row cannot be read",
          'a quoted cell must end with a quote followed by a comma or the end of the line; double any quote inside it ("")');
        continue;
      }
      if (!warnedEncoding && rec.fields.some((f) => f.includes("\uFFFD"))) {
        warnedEncoding = true;
        ctx.warn(rec.line, 0, NOT_UTF8_MESSAGE, `${NOT_UTF8_HINT} (in Excel: CSV UTF-8)`);
      }
      const nul = rec.fields.findIndex((f) => f.includes("\u0000"));
      if (nul !== -1) {
        ctx.reject(rec.line, nul + 1, "row contains a NUL character (binary data?)", "save the file as plain UTF-8 text; remove the row if it is garbage");
        continue;
      }
      if (rec.fields.length > width) {
        ctx.reject(rec.line, width + 1, `row has ${rec.fields.length} fields, the header has ${width}`,
          'check for a stray comma; quote text that contains commas ("a, b")');
        continue;
      }
      const row = new Row(rec.line, rec.fields, columns, ctx);
      onRow(row);
      // A row is used unless a check rejected it: handlers only report problems.
      if (!row.failed) ctx.use();
    }
  } catch (err) {
    aborted = true;
    const e = err as { message?: string };
    ctx.error(0, 0, `cannot read the rest of the file: ${describeReadError(err) ?? e.message ?? String(err)}`, "check the file and the drive it is on");
  } finally {
    await opened.handle.close().catch(() => undefined);
  }
  if (columns === null) {
    if (!aborted) ctx.error(0, 0, "file is empty (no header row)", `add a header naming: ${spec.required.join(", ")}`);
    return { notFound: false, missingColumns: [...spec.required] };
  }
  return { notFound: false, missingColumns: [] };
}

const describeReadError = (err: unknown): string | null => {
  const code = (err as { code?: string }).code;
  return code ? describeFsError(err) : null;
};
