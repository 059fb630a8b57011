/**
 * ISO 8601 timestamp parsing straight from bytes (no string allocated per row), for the
 * interval and weather readers. Accepted: `YYYY-MM-DDTHH:MM[:SS[.fff]]` with `T` or a space,
 * optionally followed by `Z`, `±HH:MM` or `±HHMM`. Everything else is rejected with a reason.
 */
import { daysFromCivil, daysInMonth } from "./fields.ts";

/** Result slots, reused between calls to avoid allocating per row. */
export interface TimestampScratch {
  /** Wall-clock time as if it were UTC, epoch ms. */
  wallMs: number;
  /** Stated UTC offset in minutes, or NaN when the timestamp has none (local time). */
  offsetMinutes: number;
  /** Empty when valid; otherwise why not. */
  error: string;
  /** The last valid date part (10 bytes) and its day start: consecutive rows mostly share the day. */
  lastDate: Uint8Array;
  lastDayMs: number;
}

export function newTimestampScratch(): TimestampScratch {
  return { wallMs: 0, offsetMinutes: Number.NaN, error: "", lastDate: new Uint8Array(10), lastDayMs: Number.NaN };
}

/** Hint shown with every timestamp rejection. */
export const TIMESTAMP_HINT =
  "write ISO 8601 like 2024-03-10T14:15 (local time of the building) or 2024-03-10T14:15:00-05:00 / ...Z";

function d2(b: Uint8Array, i: number): number {
  const a = b[i] - 48;
  const c = b[i + 1] - 48;
  if (a < 0 || a > 9 || c < 0 || c > 9) return -1;
  return a * 10 + c;
}

/**
 * Parses bytes `[start, end)` of `buf` as an ISO 8601 timestamp into `out`.
 * Returns true when valid. Example: "2024-11-03T01:30" → wallMs of 01:30 that day, offset NaN.
 */
export function parseTimestampBytes(buf: Uint8Array, start: number, end: number, out: TimestampScratch): boolean {
  out.error = "";
  out.offsetMinutes = Number.NaN;
  const len = end - start;
  if (len < 16) {
    out.error = len === 10 ? "has a date but no time of day" : "is not an ISO 8601 timestamp";
    return false;
  }
  const i = start;
  const sep = buf[i + 10];
  const h = d2(buf, i + 11);
  const mi = d2(buf, i + 14);
  if (h < 0 || mi < 0 || (sep !== 84 && sep !== 32) || buf[i + 13] !== 58) {
    out.error = "is not an ISO 8601 timestamp";
    return false;
  }
  if (h > 23 || mi > 59) {
    out.error = "has an hour or minute out of range";
    return false;
  }
  const last = out.lastDate;
  let dayMs = out.lastDayMs;
  if (
    dayMs !== dayMs || buf[i + 9] !== last[9] || buf[i + 8] !== last[8] || buf[i + 7] !== last[7] || buf[i + 6] !== last[6] ||
    buf[i + 5] !== last[5] || buf[i + 4] !== last[4] || buf[i + 3] !== last[3] || buf[i + 2] !== last[2] ||
    buf[i + 1] !== last[1] || buf[i] !== last[0]
  ) {
    const y1 = d2(buf, i);
    const y2 = d2(buf, i + 2);
    const mo = d2(buf, i + 5);
    const d = d2(buf, i + 8);
    if (y1 < 0 || y2 < 0 || mo < 0 || d < 0 || buf[i + 4] !== 45 || buf[i + 7] !== 45) {
      out.error = "is not an ISO 8601 timestamp";
      return false;
    }
    const y = y1 * 100 + y2;
    if (mo < 1 || mo > 12 || d < 1 || d > daysInMonth(y, mo)) {
      out.error = "is not a real calendar day";
      return false;
    }
    dayMs = daysFromCivil(y, mo, d) * 86400000;
    for (let k = 0; k < 10; k++) last[k] = buf[i + k];
    out.lastDayMs = dayMs;
  }
  let p = i + 16;
  let ms = 0;
  if (p < end && buf[p] === 58) {
    const s = d2(buf, p + 1);
    if (p + 3 > end || s < 0 || s > 59) {
      out.error = "has invalid seconds";
      return false;
    }
    ms = s * 1000;
    p += 3;
    if (p < end && buf[p] === 46) {
      p++;
      let scale = 100;
      const fracStart = p;
      while (p < end && buf[p] >= 48 && buf[p] <= 57) {
        ms += (buf[p] - 48) * scale;
        scale /= 10;
        p++;
      }
      if (p === fracStart) {
        out.error = "has an empty fraction of a second";
        return false;
      }
      ms = Math.round(ms);
    }
  }
  out.wallMs = dayMs + h * 3600000 + mi * 60000 + ms;
  if (p === end) return true;
  const c = buf[p];
  if (c === 90 && p + 1 === end) {
    out.offsetMinutes = 0;
    return true;
  }
  if (c === 43 || c === 45) {
    const oh = d2(buf, p + 1);
    let om: number;
    if (p + 6 === end && buf[p + 3] === 58) om = d2(buf, p + 4);
    else if (p + 5 === end) om = d2(buf, p + 3);
    else if (p + 3 === end) om = 0;
    else om = -1;
    if (oh < 0 || om < 0 || oh > 18 || om > 59) {
      out.error = "has an invalid UTC offset";
      return false;
    }
    out.offsetMinutes = (c === 45 ? -1 : 1) * (oh * 60 + om);
    return true;
  }
  out.error = "has unexpected text after the time";
  return false;
}

const encoder = new TextEncoder();

/** String form of {@link parseTimestampBytes}, for the small files read with csv-parse. */
export function parseTimestampString(text: string, out: TimestampScratch): boolean {
  const bytes = encoder.encode(text.trim());
  return parseTimestampBytes(bytes, 0, bytes.length, out);
}
