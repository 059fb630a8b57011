/**
 * Purpose-built streaming reader for interval files (`meter_id,timestamp,value[,interval_minutes]`,
 * any column order). Works on raw bytes chunk by chunk — a file's text is never held whole —
 * and hands each accepted row to a sink, so callers can collect series or aggregate on the fly.
 * Quoted fields are rare in these files; a line containing a quote takes a slower,
 * fully RFC 4180 path for that line. A quoted field spanning lines is rejected.
 */
import { quoteValue, shorten, type InputIssue } from "../core/issues.ts";
import type { FileReport } from "../domain/types.ts";
import { numberProblem, parseStrictNumber } from "./fields.ts";
import { TIMESTAMP_HINT, newTimestampScratch, parseTimestampBytes } from "./timestamp.ts";
import { splitCsvLine } from "./splitCsvLine.ts";
import { DETAILS_PER_REASON, FileContext } from "./fileContext.ts";
import { trimId } from "../core/trimId.ts";
import { MAX_INTERVAL_VALUE, MAX_YEAR, MIN_YEAR, limitText } from "./limits.ts";
import { type LocalTimeResolver, isValidZone, sharedResolver } from "../core/time/index.ts";

const MIN_INSTANT_MS = Date.UTC(MIN_YEAR, 0, 1);
const MAX_INSTANT_MS = Date.UTC(MAX_YEAR + 1, 0, 1);

/** Receives accepted rows. `instantMs` is the UTC instant of the timestamp as written (start or end). */
export interface IntervalSink {
  /** Called before the first row of each meter in each file; returns the index passed to row(). */
  meter(meterId: string): number;
  /** `intervalMinutes` is NaN when the file has no interval_minutes column or the cell is empty. */
  row(meterIndex: number, instantMs: number, value: number, line: number, intervalMinutes: number): void;
}

export interface IntervalParseOptions {
  /** Path shown in issues, e.g. `data/demo/intervals/2024.csv`. */
  fileLabel: string;
  /** IANA zone of the meter's building, or null when the meter is unknown (rows rejected). */
  zoneOfMeter: (meterId: string) => string | null;
  sink: IntervalSink;
  /** Why a meter is unknown, when the caller knows better than "not in meters.csv". */
  unknownMeterReason?: (meterId: string) => string | null;
}

export interface IntervalFileResult {
  report: FileReport;
  issues: InputIssue[];
  /** True when the file could not be read at all (no header / missing column). */
  skipped: boolean;
}

const ALLOWED_MINUTES = new Set([5, 15, 30, 60]);
const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];
const KNOWN_COLUMNS = ["meter_id", "timestamp", "value", "interval_minutes"];

/**
 * Byte classes for the line scan: 1 comma, 2 line end (LF, or CR: a lone CR ends a line in old
 * Mac exports, and CRLF counts once), 3 double quote, 0 anything else.
 */
const BYTE_CLASS = new Uint8Array(256);
BYTE_CLASS[44] = 1;
BYTE_CLASS[10] = 2;
BYTE_CLASS[13] = 2;
BYTE_CLASS[34] = 3;

/** Index of the first LF or CR in `b`, or -1. */
function firstLineEnd(b: Uint8Array): number {
  for (let i = 0; i < b.length; i++) if (b[i] === 10 || b[i] === 13) return i;
  return -1;
}

interface MeterSlot {
  meterId: string;
  sinkIndex: number;
  resolver: LocalTimeResolver | null;
  lastInstantMs: number;
  /** Rows rejected because the meter is unknown. */
  unknownRows: number;
  firstLine: number;
}

/**
 * Reads one interval file from a byte stream, validating every row strictly (ISO timestamps,
 * plain decimal numbers, known meters, real local times) and streaming accepted rows to
 * `options.sink`. Local timestamps are converted with the meter's zone; in the repeated
 * fall-back hour a wall time seen twice in a row is the later instant. Duplicates, order and
 * interval length are NOT judged here (see assembleIntervals.ts) because they need all files.
 * Example: `await parseIntervalStream(fs.createReadStream(p), { fileLabel, zoneOfMeter, sink })`.
 */
export async function parseIntervalStream(
  stream: AsyncIterable<Uint8Array | string>,
  options: IntervalParseOptions,
): Promise<IntervalFileResult> {
  const { fileLabel, zoneOfMeter, sink } = options;
  // Rejections are recorded and grouped like every other file's (FileContext).
  const ctx = new FileContext(fileLabel);
  const report: FileReport = ctx.report;
  const issues: InputIssue[] = ctx.issues;
  const reject = (line: number, column: number, message: string, hint: string): void => ctx.reject(line, column, message, hint);

  // Column positions, -1 when absent.
  let colMeter = -1;
  let colTs = -1;
  let colValue = -1;
  let colMinutes = -1;
  let nCols = 0;
  let headerDone = false;
  let skipped = false;
  let lineNo = 0;

  const fieldStart = new Int32Array(64);
  const fieldEnd = new Int32Array(64);
  const ts = newTimestampScratch();
  const slots = new Map<string, MeterSlot>();
  let cur: MeterSlot | null = null;
  let curIdBytes = new Uint8Array(64);
  let curIdLen = -1;
  const decoder = new TextDecoder();

  const slotFor = (meterId: string, line: number): MeterSlot => {
    let slot = slots.get(meterId);
    if (slot) return slot;
    const zone = zoneOfMeter(meterId);
    let resolver: LocalTimeResolver | null = null;
    if (zone !== null && isValidZone(zone)) resolver = sharedResolver(zone);
    slot = {
      meterId,
      sinkIndex: zone === null ? -1 : sink.meter(meterId),
      resolver,
      lastInstantMs: Number.NaN,
      unknownRows: 0,
      firstLine: line,
    };
    slots.set(meterId, slot);
    return slot;
  };

  const readHeader = (text: string): void => {
    const split = splitCsvLine(text);
    const names = (split.fields ?? text.split(",")).map((n) => n.trim().toLowerCase());
    nCols = names.length;
    colMeter = names.indexOf("meter_id");
    colTs = names.indexOf("timestamp");
    colValue = names.indexOf("value");
    colMinutes = names.indexOf("interval_minutes");
    const missing = ["meter_id", "timestamp", "value"].filter((n) => !names.includes(n));
    if (missing.length > 0) {
      skipped = true;
      issues.push({
        file: fileLabel, line: lineNo, column: 0, severity: "error",
        message: `interval file has no ${missing.join(", ")} column (header: ${quoteValue(text.slice(0, 80))})`,
        hint: "the first line must name the columns: meter_id,timestamp,value[,interval_minutes]",
      });
      return;
    }
    const twice = names.findIndex((n, i) => n !== "" && names.indexOf(n) !== i);
    if (twice !== -1) {
      const msg = `column ${quoteValue(names[twice])} appears twice; the first one is used`;
      report.warnings.push(msg);
      issues.push({ file: fileLabel, line: lineNo, column: twice + 1, severity: "warning", message: msg, hint: "remove the repeated column" });
    }
    const unknown = names.filter((n) => !KNOWN_COLUMNS.includes(n));
    if (unknown.length > 0) {
      const msg = `unknown column(s) ignored: ${shorten(unknown.join(", "))}`;
      report.warnings.push(msg);
      issues.push({
        file: fileLabel, line: lineNo, column: names.indexOf(unknown[0]) + 1, severity: "warning",
        message: msg, hint: "known columns: meter_id, timestamp, value, interval_minutes",
      });
    }
  };

  /** Validates one data row whose fields are at fieldStart/fieldEnd in `b`. */
  const processFields = (b: Uint8Array, n: number): void => {
    const line = lineNo;
    if (n !== nCols) {
      reject(line, 0, `row has ${n} fields, the header has ${nCols}`, "check for a stray comma or a missing cell");
      return;
    }
    // Meter id, with surrounding spaces ignored; compared by bytes with the previous row.
    let ms = fieldStart[colMeter];
    let me = fieldEnd[colMeter];
    while (ms < me && (b[ms] === 32 || b[ms] === 9)) ms++;
    while (me > ms && (b[me - 1] === 32 || b[me - 1] === 9)) me--;
    const idLen = me - ms;
    if (idLen === 0) {
      reject(line, colMeter + 1, "meter_id is empty", "every row needs the meter_id of meters.csv");
      return;
    }
    let same = idLen === curIdLen;
    if (same) {
      for (let k = 0; k < idLen; k++) {
        if (b[ms + k] !== curIdBytes[k]) {
          same = false;
          break;
        }
      }
    }
    if (!same) {
      // Ids follow the one rule of every file (trimId): a trailing no-break space is not part of it.
      const id = trimId(decoder.decode(b.subarray(ms, me)));
      if (id === "") {
        curIdLen = -1;
        reject(line, colMeter + 1, "meter_id is empty", "every row needs the meter_id of meters.csv");
        return;
      }
      cur = slotFor(id, line);
      if (idLen > curIdBytes.length) curIdBytes = new Uint8Array(idLen * 2);
      curIdBytes.set(b.subarray(ms, me));
      curIdLen = idLen;
    }
    const slot = cur as MeterSlot;
    if (slot.sinkIndex < 0) {
      slot.unknownRows++;
      report.rowsRejected++;
      return;
    }

    // Timestamp.
    let ts0 = fieldStart[colTs];
    let ts1 = fieldEnd[colTs];
    while (ts0 < ts1 && b[ts0] === 32) ts0++;
    while (ts1 > ts0 && b[ts1 - 1] === 32) ts1--;
    if (ts0 === ts1) {
      reject(line, colTs + 1, "timestamp is empty", TIMESTAMP_HINT);
      return;
    }
    if (!parseTimestampBytes(b, ts0, ts1, ts)) {
      const text = decoder.decode(b.subarray(ts0, ts1));
      reject(line, colTs + 1, `timestamp ${quoteValue(text)} ${ts.error}`, TIMESTAMP_HINT);
      return;
    }

    // Value: fast exact path for up to 15 significant digits, strict everywhere.
    let vs = fieldStart[colValue];
    let ve = fieldEnd[colValue];
    while (vs < ve && b[vs] === 32) vs++;
    while (ve > vs && b[ve - 1] === 32) ve--;
    if (vs === ve) {
      reject(line, colValue + 1, "value is empty", "drop the row or give the reading; missing intervals are detected later");
      return;
    }
    let p = vs;
    let neg = false;
    if (b[p] === 45 || b[p] === 43) {
      neg = b[p] === 45;
      p++;
    }
    let mant = 0;
    let digits = 0;
    let frac = 0;
    let dot = false;
    for (; p < ve; p++) {
      const c = b[p];
      if (c >= 48 && c <= 57) {
        mant = mant * 10 + (c - 48);
        digits++;
        if (dot) frac++;
      } else if (c === 46 && !dot) dot = true;
      else break;
    }
    let value: number;
    if (p === ve && digits > 0 && digits <= 15) {
      value = frac === 0 ? mant : mant / POW10[frac];
      if (neg) value = -value;
    } else {
      const text = decoder.decode(b.subarray(vs, ve));
      const parsed = parseStrictNumber(text, "value");
      if (!parsed.ok) {
        reject(line, colValue + 1, parsed.problem.message, parsed.problem.hint);
        return;
      }
      value = parsed.value;
    }
    if (value > MAX_INTERVAL_VALUE || value < -MAX_INTERVAL_VALUE) {
      reject(line, colValue + 1, `value ${quoteValue(decoder.decode(b.subarray(vs, ve)))} is beyond ±${limitText(MAX_INTERVAL_VALUE)}`,
        "check the unit and the decimal point; one interval reading is far smaller");
      return;
    }

    let minutes = Number.NaN;
    if (colMinutes >= 0) {
      const s0 = fieldStart[colMinutes];
      const s1 = fieldEnd[colMinutes];
      if (s1 > s0) {
        const text = decoder.decode(b.subarray(s0, s1)).trim();
        const m = text === "" ? Number.NaN : Number(text);
        if (text !== "" && !ALLOWED_MINUTES.has(m)) {
          const problem = /^\d+$/.test(text) ? null : numberProblem(text, "interval_minutes");
          reject(
            line, colMinutes + 1,
            problem ? problem.message : `interval_minutes ${quoteValue(text)} is not one of 5, 15, 30, 60`,
            "interval_minutes must be 5, 15, 30 or 60 (or leave it empty to infer it)",
          );
          return;
        }
        minutes = m;
      }
    }

    let instant: number;
    if (ts.offsetMinutes === ts.offsetMinutes) instant = ts.wallMs - ts.offsetMinutes * 60000;
    else if (slot.resolver === null) {
      reject(line, colTs + 1, `timestamp has no UTC offset and meter ${slot.meterId} has no valid building time zone`,
        "fix the building's timezone in buildings.csv or add an offset like -05:00");
      return;
    } else {
      instant = slot.resolver.resolve(ts.wallMs, slot.lastInstantMs);
      if (instant !== instant) {
        const text = decoder.decode(b.subarray(ts0, ts1));
        reject(
          line, colTs + 1,
          `local time ${text} does not exist in ${slot.resolver.zoneName} (clocks jump forward for daylight saving time)`,
          "a logger on local time never writes this hour; check the device clock, or write timestamps with a UTC offset",
        );
        return;
      }
    }
    if (!(instant >= MIN_INSTANT_MS && instant < MAX_INSTANT_MS)) {
      reject(line, colTs + 1, `timestamp ${quoteValue(decoder.decode(b.subarray(ts0, ts1)))} is outside the years ${MIN_YEAR}–${MAX_YEAR}`, "check the year");
      return;
    }
    slot.lastInstantMs = instant;
    report.rowsUsed++;
    sink.row(slot.sinkIndex, instant, value, line, minutes);
  };

  /**
   * Handles one physical line [s, e) (newline excluded) whose `n` fields were already split at
   * fieldStart/fieldEnd by the caller's scan; `quoted` when the line contains a double quote.
   */
  const processLine = (b: Uint8Array, s: number, e: number, n: number, quoted: boolean): void => {
    lineNo++;
    if (e > s && b[e - 1] === 13) {
      e--;
      fieldEnd[n - 1] = e;
    }
    if (lineNo === 1 && e - s >= 3 && b[s] === 0xef && b[s + 1] === 0xbb && b[s + 2] === 0xbf) {
      s += 3;
      fieldStart[0] = s;
    }
    if (e === s || skipped) return; // blank line: not a row
    if (!headerDone) {
      headerDone = true;
      readHeader(decoder.decode(b.subarray(s, e)));
      return;
    }
    report.rowsRead++;
    if (quoted) processQuoted(decoder.decode(b.subarray(s, e)));
    else processFields(b, n);
  };

  /** Splits [s, e) into fields and processes it (used for the few lines that straddle chunks). */
  const splitAndProcess = (b: Uint8Array, s: number, e: number): void => {
    let n = 0;
    let quoted = false;
    fieldStart[0] = s;
    for (let j = s; j < e; j++) {
      const c = b[j];
      if (c === 44) {
        fieldEnd[n] = j;
        if (n < 62) n++;
        fieldStart[n] = j + 1;
      } else if (c === 34) quoted = true;
    }
    fieldEnd[n] = e;
    processLine(b, s, e, n + 1, quoted);
  };

  const encoder = new TextEncoder();
  const processQuoted = (text: string): void => {
    const split = splitCsvLine(text);
    if (split.fields === null) {
      reject(lineNo, split.errorColumn, `malformed quoted field: ${split.error}`,
        'quote a whole cell as "..." and double any quote inside it ("")');
      return;
    }
    const parts = split.fields.map((f) => encoder.encode(f));
    const total = parts.reduce((a, p) => a + p.length, 0);
    const joined = new Uint8Array(total);
    let off = 0;
    const n = Math.min(parts.length, 63);
    for (let k = 0; k < n; k++) {
      joined.set(parts[k], off);
      fieldStart[k] = off;
      off += parts[k].length;
      fieldEnd[k] = off;
    }
    curIdLen = -1; // the bytes moved to another buffer; force a fresh meter lookup
    processFields(joined, parts.length);
  };

  // One pass over each chunk finds line ends and field separators together; lines are
  // processed in place, only a line straddling two chunks is copied.
  let carry: Uint8Array | null = null;
  /** The previous chunk ended with CR: an LF starting this chunk belongs to that CRLF. */
  let pendingCR = false;
  for await (const raw of stream) {
    const chunk: Uint8Array =
      typeof raw === "string" ? encoder.encode(raw) : new Uint8Array(raw.buffer, raw.byteOffset, raw.byteLength);
    const len = chunk.length;
    let s = 0;
    if (pendingCR && len > 0) {
      pendingCR = false;
      if (chunk[0] === 10) s = 1;
    }
    if (carry !== null) {
      const nl = firstLineEnd(chunk);
      if (nl === -1) {
        const grown: Uint8Array = new Uint8Array(carry.length + len);
        grown.set(carry, 0);
        grown.set(chunk, carry.length);
        carry = grown;
        continue;
      }
      const joined = new Uint8Array(carry.length + nl);
      joined.set(carry, 0);
      joined.set(chunk.subarray(0, nl), carry.length);
      splitAndProcess(joined, 0, joined.length);
      carry = null;
      s = nl + 1;
      if (chunk[nl] === 13) {
        if (nl + 1 < len && chunk[nl + 1] === 10) s++;
        else if (nl + 1 === len) pendingCR = true;
      }
    }
    let n = 0;
    let quoted = false;
    fieldStart[0] = s;
    for (let j = s; j < len; j++) {
      const cls = BYTE_CLASS[chunk[j]];
      if (cls === 0) continue;
      if (cls === 1) {
        fieldEnd[n] = j;
        if (n < 62) n++;
        fieldStart[n] = j + 1;
      } else if (cls === 2) {
        fieldEnd[n] = j;
        processLine(chunk, s, j, n + 1, quoted);
        if (chunk[j] === 13) {
          if (j + 1 < len && chunk[j + 1] === 10) j++;
          else if (j + 1 === len) pendingCR = true;
        }
        s = j + 1;
        n = 0;
        quoted = false;
        fieldStart[0] = s;
      } else quoted = true;
    }
    carry = s < len ? chunk.slice(s) : null;
    if (skipped) break;
  }
  if (carry !== null && !skipped) splitAndProcess(carry, 0, carry.length);

  if (!headerDone && !skipped) {
    skipped = true;
    issues.push({ file: fileLabel, line: 0, column: 0, severity: "error", message: "interval file is empty",
      hint: "remove the file or add a header line meter_id,timestamp,value and rows" });
  }
  let unknownListed = 0;
  for (const slot of slots.values()) {
    if (slot.unknownRows > 0) {
      const why = options.unknownMeterReason?.(slot.meterId) ?? null;
      const message = `meter_id ${quoteValue(slot.meterId)} ${why ?? "is not in meters.csv"}: ${slot.unknownRows} row(s) rejected`;
      ctx.error(slot.firstLine, colMeter + 1, message, why ? "fix that meter row first" : "add the meter to meters.csv or correct the meter_id");
      if (unknownListed++ < DETAILS_PER_REASON) report.rejections.push({ line: slot.firstLine, reason: message });
    }
  }
  ctx.finish();
  return { report, issues, skipped };
}
