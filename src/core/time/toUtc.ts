/**
 * Local wall-clock time → UTC instant in one IANA zone, DST-aware, without calling luxon per
 * row: the zone offset is cached per local day, and only days next to a DST transition are
 * resolved per hour (and per row inside the transition hour itself).
 */
import { TimeInputError } from "../errors.ts";
import { DateTime } from "luxon";
import { assertValidZone, zoneOffsetMs } from "./zone.ts";

const DAY_MS = 86400000;
const HOUR_MS = 3600000;
/** Far enough past any real UTC offset (−12 h … +14 h) that a window covers a whole local day. */
const SLACK_MS = 18 * HOUR_MS;

/** Outcome of {@link LocalTimeResolver.resolve} besides the instant. */
export type LocalTimeKind = "unique" | "repeated" | "nonexistent";

export class LocalTimeResolver {
  readonly zoneName: string;
  /** Per local day: offset in ms when constant all day, NaN when the day needs hourly care. */
  private readonly dayOffset = new Map<number, number>();
  /** Per local hour on transition days: offset in ms, NaN inside a transition hour. */
  private readonly hourOffset = new Map<number, number>();
  private lastDay = Number.NaN;
  private lastDayOffsetMs = 0;
  /** Set by the last call to resolve(). */
  kind: LocalTimeKind = "unique";

  /** @throws TimeInputError when `zoneName` is not a valid IANA zone (validate it beforehand). */
  constructor(zoneName: string) {
    assertValidZone(zoneName);
    this.zoneName = zoneName;
  }

  private offsetMs(instantMs: number): number {
    return zoneOffsetMs(this.zoneName, instantMs);
  }

  /**
   * Converts a wall-clock time (epoch ms as if the wall time were UTC) to the UTC instant.
   * In a repeated (fall-back) hour the earlier instant is chosen unless the same meter's
   * previous reading `previousInstantMs` is already at or after it — then the later one,
   * so a wall time seen twice in a row is read as the repeated hour. Returns NaN for a
   * wall time skipped by spring-forward. Example (America/New_York): 2024-11-03 01:30
   * → 05:30Z, then 01:30 again → 06:30Z; 2024-03-10 02:30 → NaN.
   */
  resolve(wallMs: number, previousInstantMs: number): number {
    const day = Math.floor(wallMs / DAY_MS);
    if (day === this.lastDay && this.lastDayOffsetMs === this.lastDayOffsetMs) {
      this.kind = "unique";
      return wallMs - this.lastDayOffsetMs;
    }
    let off = this.dayOffset.get(day);
    if (off === undefined) {
      const a = this.offsetMs(day * DAY_MS - SLACK_MS);
      const b = this.offsetMs((day + 1) * DAY_MS + SLACK_MS);
      off = a === b ? a : Number.NaN;
      this.dayOffset.set(day, off);
    }
    this.lastDay = day;
    this.lastDayOffsetMs = off;
    if (off === off) {
      this.kind = "unique";
      return wallMs - off;
    }
    const hour = Math.floor(wallMs / HOUR_MS);
    let hOff = this.hourOffset.get(hour);
    if (hOff === undefined) {
      const w0 = hour * HOUR_MS;
      const o0 = this.exactOffsets(w0);
      const o1 = this.exactOffsets(w0 + HOUR_MS - 1);
      hOff = o0.length === 1 && o1.length === 1 && o0[0] === o1[0] ? o0[0] : Number.NaN;
      this.hourOffset.set(hour, hOff);
    }
    if (hOff === hOff) {
      this.kind = "unique";
      return wallMs - hOff;
    }
    const offs = this.exactOffsets(wallMs);
    if (offs.length === 0) {
      this.kind = "nonexistent";
      return Number.NaN;
    }
    if (offs.length === 1) {
      this.kind = "unique";
      return wallMs - offs[0];
    }
    this.kind = "repeated";
    const early = wallMs - Math.max(offs[0], offs[1]);
    const late = wallMs - Math.min(offs[0], offs[1]);
    return previousInstantMs >= early ? late : early;
  }

  /** Every offset (ms) under which `wallMs` is a real local time: 0, 1 or 2 of them. */
  private exactOffsets(wallMs: number): number[] {
    const a = this.offsetMs(wallMs - DAY_MS);
    const b = this.offsetMs(wallMs + DAY_MS);
    const out: number[] = [];
    if (this.offsetMs(wallMs - a) === a) out.push(a);
    if (b !== a && this.offsetMs(wallMs - b) === b) out.push(b);
    return out;
  }
}

const shared = new Map<string, LocalTimeResolver>();

/**
 * A resolver for `zoneName` shared by every reader in the process, so the per-day offset
 * cache is built once per zone rather than once per file. The zone must be valid.
 */
export function sharedResolver(zoneName: string): LocalTimeResolver {
  let r = shared.get(zoneName);
  if (r === undefined) {
    r = new LocalTimeResolver(zoneName);
    shared.set(zoneName, r);
  }
  return r;
}

/**
 * UTC instant (epoch ms) of local midnight starting `isoDate` in `zone`. Luxon applies the zone
 * rules (a midnight that does not exist moves forward). Bills are half-open local-day periods, so
 * [localMidnightMs(start, zone), localMidnightMs(end, zone)) is exactly a bill's service period,
 * whatever DST does inside it.
 * @throws TimeInputError when the date or zone is invalid.
 * @example localMidnightMs("2024-03-10", "America/New_York") // 2024-03-10T05:00:00Z
 */
export function localMidnightMs(isoDate: string, zone: string): number {
  const key = `${zone}|${isoDate}`;
  const hit = midnightCache.get(key);
  if (hit !== undefined) return hit;
  const dt = DateTime.fromISO(isoDate, { zone }).startOf("day");
  if (!dt.isValid) throw new TimeInputError(`invalid date '${isoDate}' in zone '${zone}': ${dt.invalidExplanation ?? ""}`);
  // Bills, forecasts and reconciliation ask for the same few thousand midnights again and again.
  if (midnightCache.size >= 100_000) midnightCache.clear();
  midnightCache.set(key, dt.toMillis());
  return dt.toMillis();
}

const midnightCache = new Map<string, number>();
