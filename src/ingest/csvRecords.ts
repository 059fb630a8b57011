/**
 * RFC 4180 record reader for the small CSV files, built so that one bad quote costs one row.
 *
 * Lines end at CRLF, LF or a lone CR (old Mac exports), so every line ending convention reads
 * the same. A quoted cell may span lines (RFC 4180 §2.6), but only when the record it belongs
 * to is well formed: the quote closes, is followed by a comma or the end of a line, the record
 * has no more fields than the header, and it spans at most {@link MAX_RECORD_LINES} lines.
 * Otherwise the quote is treated as stray: the line where it opened is reported (at the field
 * where the quote opens) and reading resumes on the very next line, so the rows after it are
 * still read. A quote inside an unquoted cell (`He said "hi"`) is kept as text.
 */

/** One record: its fields, or the reason it could not be read. */
export interface CsvRecord {
  /** 1-based physical line where the record starts. */
  line: number;
  /** Fields, or null when the record is malformed (see `error`). */
  fields: string[] | null;
  /** Why the record was rejected: the 1-based field number where the problem starts. */
  error: { column: number; message: string } | null;
}

/**
 * Longest span of one record, in lines. A legitimate multi-line cell (an address, a note) is a
 * few lines; a quote left open by mistake swallows the rest of the file. 100 lines keeps the
 * look-back buffer small while allowing any hand-written note (common practice: no standard).
 */
export const MAX_RECORD_LINES = 100;

/**
 * Splits a decoded text stream into physical lines without their terminators. CRLF, LF and a
 * lone CR each end one line; a final line without a terminator is returned too.
 * @example for await (const l of physicalLines(Readable.from(["a\rb\r\nc"]))) → "a", "b", "c"
 */
export async function* physicalLines(chunks: AsyncIterable<Uint8Array | string>): AsyncGenerator<string> {
  const decoder = new TextDecoder("utf-8");
  let buf = "";
  // buf[0, searched) holds no line break: a very long line is scanned once, not once per chunk.
  let searched = 0;
  const drain = function* (final: boolean): Generator<string> {
    let start = 0;
    let lf = buf.indexOf("\n", searched);
    let cr = buf.indexOf("\r", searched);
    for (;;) {
      let end: number;
      let next: number;
      if (lf === -1 && cr === -1) break;
      if (cr === -1 || (lf !== -1 && lf < cr)) {
        end = lf;
        next = lf + 1;
      } else {
        if (cr === buf.length - 1 && !final) break; // a CRLF may be split across chunks
        end = cr;
        next = buf.charCodeAt(cr + 1) === 10 ? cr + 2 : cr + 1;
      }
      yield buf.slice(start, end);
      start = next;
      if (lf !== -1 && lf < start) lf = buf.indexOf("\n", start);
      if (cr !== -1 && cr < start) cr = buf.indexOf("\r", start);
    }
    buf = buf.slice(start);
    // A CR at the very end may still pair with an LF in the next chunk: look at it again.
    searched = Math.max(0, buf.length - 1);
  };
  for await (const chunk of chunks) {
    buf += typeof chunk === "string" ? chunk : decoder.decode(chunk, { stream: true });
    yield* drain(false);
  }
  buf += decoder.decode();
  yield* drain(true);
  if (buf !== "") yield buf;
}

type Scan =
  | { kind: "done"; fields: string[] }
  | { kind: "open" } // a quoted cell is still open at the end of the text
  | { kind: "bad"; column: number; message: string };

/**
 * Scans `text` (one or more physical lines joined by "\n") as one record.
 * `quoteColumn` of an open or bad scan is the field where the offending quote opened.
 */
function scanRecord(text: string): Scan & { quoteColumn: number } {
  const fields: string[] = [];
  const n = text.length;
  let i = 0;
  for (;;) {
    if (text.charCodeAt(i) === 34) {
      const column = fields.length + 1;
      let value = "";
      let j = i + 1;
      for (;;) {
        const q = text.indexOf('"', j);
        if (q === -1) return { kind: "open", quoteColumn: column };
        value += text.slice(j, q);
        if (text.charCodeAt(q + 1) === 34) {
          value += '"';
          j = q + 2;
        } else {
          j = q + 1;
          break;
        }
      }
      if (j < n && text.charCodeAt(j) !== 44) {
        return { kind: "bad", quoteColumn: column, column, message: "text follows the closing quote of a quoted cell" };
      }
      fields.push(value);
      if (j >= n) break;
      i = j + 1;
      if (i === n) {
        fields.push("");
        break;
      }
    } else {
      const c = text.indexOf(",", i);
      if (c === -1) {
        fields.push(text.slice(i));
        break;
      }
      fields.push(text.slice(i, c));
      i = c + 1;
      if (i === n) {
        fields.push("");
        break;
      }
    }
  }
  return { kind: "done", fields, quoteColumn: 0 };
}

const STRAY_QUOTE = (column: number): string =>
  `the quote that opens field ${column} is never properly closed; this row was skipped and reading went on with the next line`;

/**
 * Reads records from physical lines. `maxFields()` is consulted for multi-line records (the
 * header's width once known; Infinity before). Blank lines are skipped.
 */
export async function* csvRecords(lines: AsyncIterable<string>, maxFields: () => number): AsyncGenerator<CsvRecord> {
  const it = lines[Symbol.asyncIterator]();
  /** Lines taken back after a failed multi-line attempt, in order, with their numbers. */
  const replay: { text: string; line: number }[] = [];
  let lineNo = 0;
  const next = async (): Promise<{ text: string; line: number } | null> => {
    if (replay.length > 0) return replay.shift()!;
    const r = await it.next();
    if (r.done) return null;
    return { text: r.value, line: ++lineNo };
  };
  for (;;) {
    const first = await next();
    if (first === null) return;
    if (first.text === "") continue;
    if (first.text.indexOf('"') === -1) {
      yield { line: first.line, fields: splitPlain(first.text), error: null };
      continue;
    }
    const scan = scanRecord(first.text);
    if (scan.kind === "done") {
      yield { line: first.line, fields: scan.fields, error: null };
      continue;
    }
    if (scan.kind === "bad") {
      yield { line: first.line, fields: null, error: { column: scan.column, message: scan.message } };
      continue;
    }
    // A quoted cell continues on the next line(s): try, and give the lines back on failure.
    const taken: { text: string; line: number }[] = [];
    let text = first.text;
    let result: Scan = scan;
    while (result.kind === "open" && taken.length + 1 < MAX_RECORD_LINES) {
      const more = await next();
      if (more === null) break;
      taken.push(more);
      text += `\n${more.text}`;
      // A line without a quote cannot close the open cell: skip the rescan.
      if (more.text.indexOf('"') !== -1) result = scanRecord(text);
    }
    if (result.kind === "done" && result.fields.length <= maxFields()) {
      yield { line: first.line, fields: result.fields, error: null };
      continue;
    }
    yield { line: first.line, fields: null, error: { column: scan.quoteColumn, message: STRAY_QUOTE(scan.quoteColumn) } };
    replay.unshift(...taken);
  }
}

/** Splits a line without quotes at every comma. */
function splitPlain(text: string): string[] {
  return text.split(",");
}
