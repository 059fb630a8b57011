/**
 * Meter-read dates: one read per month on the meter's route day, drifting ±2 days, moved off
 * weekends, with every period kept between 28 and 33 days as on real bills.
 */
import { addDays, daysBetween, weekdayOf } from "./calendar.ts";
import { Rng } from "./prng.ts";

export const MIN_PERIOD_DAYS = 28;
export const MAX_PERIOD_DAYS = 33;

/**
 * Read dates from December 2022 through December 2025 (37 reads → 36 bills).
 * @example readDates("TWR-E")[0] // a date in 2022-12, weekday, day 3..11
 */
export function readDates(meterId: string): string[] {
  const rng = Rng.forKey(`reads:${meterId}`);
  const routeDay = rng.int(4, 9);
  const reads: string[] = [];
  for (let m = 0; m < 37; m++) {
    const year = 2022 + Math.floor((11 + m) / 12);
    const month = ((11 + m) % 12) + 1;
    const day = routeDay + rng.int(-2, 2);
    let date = `${year}-${String(month).padStart(2, "0")}-${String(day).padStart(2, "0")}`;
    const wd = weekdayOf(date);
    if (wd === 6) date = addDays(date, rng.next() < 0.5 ? -1 : 2);
    if (wd === 7) date = addDays(date, 1);
    const prev = reads[reads.length - 1];
    if (prev !== undefined) {
      const len = daysBetween(prev, date);
      if (len < MIN_PERIOD_DAYS) date = addDays(prev, MIN_PERIOD_DAYS);
      if (len > MAX_PERIOD_DAYS) date = addDays(prev, MAX_PERIOD_DAYS);
    }
    reads.push(date);
  }
  return reads;
}
