/**
 * IANA time zones: validity and UTC offsets. The only place that asks luxon about a zone.
 * A zone's offset is piecewise constant, so each UTC year's offset changes are found once
 * (weekly probes, then bisection to the second) and every instant is placed by arithmetic.
 */
import { TimeInputError } from "../errors.ts";
import { IANAZone } from "luxon";

const DAY_MS = 86_400_000;
/** Offsets are re-checked at least this often; no zone changes its offset twice within a week. */
const PROBE_MS = 7 * DAY_MS;

/** Memo of zone checks: luxon builds an Intl formatter for each check. */
const validity = new Map<string, boolean>();

/** True when `name` is an IANA zone name this runtime knows (e.g. "America/Chicago", "UTC"). */
export function isValidZone(name: string): boolean {
  let valid = validity.get(name);
  if (valid === undefined) {
    valid = IANAZone.isValidZone(name);
    validity.set(name, valid);
  }
  return valid;
}

/** @throws TimeInputError naming the zone when it is not a valid IANA zone. */
export function assertValidZone(name: string): void {
  if (!isValidZone(name)) throw new TimeInputError(`unknown time zone '${name}' (use an IANA name such as America/New_York or UTC)`);
}

const zones = new Map<string, IANAZone>();
function zoneOf(name: string): IANAZone {
  let z = zones.get(name);
  if (z === undefined) {
    assertValidZone(name);
    z = IANAZone.create(name);
    zones.set(name, z);
  }
  return z;
}

/**
 * UTC offset of `zone` at `instantMs`, in ms (local = instant + offset). Looked up directly;
 * loops over many instants should use {@link offsetSegments} instead.
 * @throws TimeInputError on an unknown zone.
 * @example zoneOffsetMs("America/New_York", Date.UTC(2025, 0, 1)) // -18_000_000
 */
export function zoneOffsetMs(zone: string, instantMs: number): number {
  return zoneOf(zone).offset(instantMs) * 60_000;
}

/** A stretch of time with one UTC offset, starting at `startMs` (UTC). */
export interface OffsetSegment {
  startMs: number;
  offsetMs: number;
}

const yearSegments = new Map<string, OffsetSegment[]>();

/** Offset changes of `zone` during one UTC calendar year, cached. The first segment starts at the year's start. */
function segmentsOfYear(zone: string, year: number): OffsetSegment[] {
  const key = `${zone}|${year}`;
  const hit = yearSegments.get(key);
  if (hit) return hit;
  const z = zoneOf(zone);
  const off = (t: number) => z.offset(t) * 60_000;
  const fromMs = Date.UTC(year, 0, 1);
  const toMs = Date.UTC(year + 1, 0, 1);
  let t = fromMs;
  let cur = off(t);
  const out: OffsetSegment[] = [{ startMs: fromMs, offsetMs: cur }];
  while (t < toMs) {
    const next = Math.min(t + PROBE_MS, toMs);
    const o = off(next);
    if (o !== cur) {
      let lo = t;
      let hi = next;
      while (hi - lo > 1000) {
        const mid = lo + Math.floor((hi - lo) / 2000) * 1000;
        if (off(mid) === cur) lo = mid;
        else hi = mid;
      }
      cur = off(hi);
      if (hi < toMs) out.push({ startMs: hi, offsetMs: cur });
      t = hi;
      continue;
    }
    t = next;
  }
  yearSegments.set(key, out);
  return out;
}

/**
 * The offset segments of `zone` covering [fromMs, toMs]; the first one is open to the past.
 * @throws TimeInputError on an unknown zone.
 */
export function offsetSegments(zone: string, fromMs: number, toMs: number): OffsetSegment[] {
  const y0 = new Date(fromMs).getUTCFullYear();
  const y1 = new Date(toMs).getUTCFullYear();
  const out: OffsetSegment[] = [];
  for (let y = y0; y <= y1; y++) {
    for (const seg of segmentsOfYear(zone, y)) {
      if (out.length > 0 && out[out.length - 1]!.offsetMs === seg.offsetMs) continue;
      out.push(seg);
    }
  }
  out[0] = { startMs: Number.NEGATIVE_INFINITY, offsetMs: out[0]!.offsetMs };
  return out;
}

let memoZone = "";
let memoFrom = Number.POSITIVE_INFINITY;
let memoTo = Number.NEGATIVE_INFINITY;
let memoSegs: OffsetSegment[] = [];

/**
 * UTC offset (ms) of `zone` at `instantMs` from the cached segments: the fast form of
 * {@link zoneOffsetMs} for per-instant loops.
 * @throws TimeInputError on an unknown zone.
 */
export function offsetAtMs(zone: string, instantMs: number): number {
  if (zone !== memoZone || instantMs < memoFrom || instantMs >= memoTo) {
    const year = new Date(instantMs).getUTCFullYear();
    memoSegs = segmentsOfYear(zone, year);
    memoZone = zone;
    memoFrom = Date.UTC(year, 0, 1);
    memoTo = Date.UTC(year + 1, 0, 1);
  }
  let off = memoSegs[0]!.offsetMs;
  for (let i = 1; i < memoSegs.length && memoSegs[i]!.startMs <= instantMs; i++) off = memoSegs[i]!.offsetMs;
  return off;
}
