/**
 * Dates as people read them, in one fixed English style ("Jan 31, 2025"), written out by hand
 * rather than through Intl so a page reads the same on every machine whatever its ICU data.
 */
import { isoDateToDayNumber, pad2 } from "./dates.ts";
import { civilDay, localPartsOf } from "./local.ts";
import { offsetAtMs } from "./zone.ts";

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

/**
 * A calendar date; no zone shift, as a bill's date is a calendar day.
 * @throws RangeError on a malformed date.
 * @example formatDate("2025-01-31") // "Jan 31, 2025"
 */
export function formatDate(isoDate: string): string {
  const d = civilDay(isoDateToDayNumber(isoDate));
  return `${MONTHS[d.month - 1]} ${d.day}, ${d.year}`;
}

/**
 * A calendar month `YYYY-MM`.
 * @example formatMonth("2025-03") // "Mar 2025"
 */
export function formatMonth(month: string): string {
  const d = civilDay(isoDateToDayNumber(`${month}-01`));
  return `${MONTHS[d.month - 1]} ${d.year}`;
}

/**
 * An instant as local date and 24-hour time in `zone`.
 * @throws TimeInputError on an unknown zone.
 * @example formatLocalDateTime(Date.UTC(2025, 2, 9, 8), "America/Chicago") // "Mar 9, 2025, 03:00"
 */
export function formatLocalDateTime(instantMs: number, zone: string): string {
  const p = localPartsOf(instantMs, zone);
  return `${MONTHS[p.month - 1]} ${p.day}, ${p.year}, ${String(p.hour).padStart(2, "0")}:${String(p.minute).padStart(2, "0")}`;
}

/**
 * An instant as an ISO 8601 local timestamp with its offset, to the second ("Z" for the zone
 * names UTC and GMT, as luxon writes them, so files written before keep their bytes).
 * @throws TimeInputError on an unknown zone.
 * @example isoWithOffset(Date.UTC(2023, 10, 14, 22, 13, 20), "America/Chicago") // "2023-11-14T16:13:20-06:00"
 */
export function isoWithOffset(instantMs: number, zone: string): string {
  const offsetMs = offsetAtMs(zone, instantMs);
  const p = localPartsOf(instantMs, zone);
  const seconds = Math.floor((((instantMs + offsetMs) % 60_000) + 60_000) % 60_000 / 1000);
  const time = `${pad2(p.hour)}:${pad2(p.minute)}:${pad2(seconds)}`;
  const lowered = zone.toLowerCase();
  let suffix: string;
  if (lowered === "utc" || lowered === "gmt") suffix = "Z";
  else {
    const minutes = Math.round(Math.abs(offsetMs) / 60_000);
    suffix = `${offsetMs < 0 ? "-" : "+"}${pad2(Math.floor(minutes / 60))}:${pad2(minutes % 60)}`;
  }
  return `${p.date}T${time}${suffix}`;
}
