import { IANAZone } from "luxon";

const DAY_MS = 86_400_000;

/**
 * Local wall-clock time of each instant, as epoch-style ms (instant + the zone's UTC offset),
 * so that `((local % DAY_MS) / 3_600_000)` is the local hour of day. Schedules follow the local
 * clock, so comparing "the same hour on other days" must too, or every DST change would move a
 * building's nights by an hour. The zone offset is looked up once per UTC day, and per instant
 * only on days where it changes. Without a zone (undefined), the instants are returned as UTC.
 * @throws RangeError when `timezone` is not a valid IANA zone.
 * @example localClockMs([Date.UTC(2025, 5, 2, 12)], "America/New_York")[0] === Date.UTC(2025, 5, 2, 8)
 */
export function localClockMs(startMs: ArrayLike<number>, timezone?: string): Float64Array {
  const out = Float64Array.from(startMs);
  if (timezone === undefined) return out;
  const zone = IANAZone.create(timezone);
  if (!zone.isValid) throw new RangeError(`unknown time zone '${timezone}'`);
  let day = NaN;
  let dayOffsetMin = 0;
  let changes = false;
  for (let i = 0; i < out.length; i++) {
    const ms = out[i]!;
    const d = Math.floor(ms / DAY_MS);
    if (d !== day) {
      day = d;
      dayOffsetMin = zone.offset(d * DAY_MS);
      changes = zone.offset(d * DAY_MS + DAY_MS - 1) !== dayOffsetMin;
    }
    out[i] = ms + (changes ? zone.offset(ms) : dayOffsetMin) * 60_000;
  }
  return out;
}
