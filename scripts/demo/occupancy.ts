/**
 * Occupancy schedules by use type: the share of the building's occupied load that is on at a
 * local wall-clock minute of a given day (0 = empty, 1 = fully in use), with one-hour ramps.
 */
import type { LocalDay } from "./calendar.ts";
import type { UseType } from "./definition.ts";

/** 0..1 ramp up over an hour before `openHour` and down over an hour after `closeHour`. */
function window(minute: number, openHour: number, closeHour: number): number {
  const h = minute / 60;
  if (h < openHour - 1 || h >= closeHour + 1) return 0;
  if (h < openHour) return h - (openHour - 1);
  if (h < closeHour) return 1;
  return 1 - (h - closeHour);
}

/** School breaks: summer, winter holidays and a spring week (invented academic calendar). */
function schoolBreak(day: LocalDay): boolean {
  const md = day.month * 100 + Number(day.date.slice(8, 10));
  return (md >= 625 && md <= 826) || md >= 1222 || md <= 102 || (md >= 407 && md <= 411);
}

/**
 * Occupancy fraction of `useType` at local clock minute `minute` of `day`.
 * Holidays count as Sundays for most uses.
 * @example occupancyFraction("office", aWednesday, 10 * 60) // 1
 */
export function occupancyFraction(useType: UseType, day: LocalDay, minute: number): number {
  const weekday = day.holiday ? 7 : day.weekday;
  const workday = weekday <= 5;
  switch (useType) {
    case "office":
      if (workday) return window(minute, 8, 17.5);
      return weekday === 6 ? 0.25 * window(minute, 9.5, 13) : 0;
    case "school":
      if (!workday) return 0;
      return schoolBreak(day) ? 0.15 * window(minute, 8.5, 14) : window(minute, 7.5, 15.5);
    case "retail":
      if (weekday === 7) return 0.8 * window(minute, 11, 18);
      return window(minute, 9.5, 21);
    case "multifamily": {
      const morning = 0.45 * window(minute, 6.5, 8.5);
      const evening = 0.75 * window(minute, 17.5, 22.5);
      const midday = workday ? 0.15 * window(minute, 10, 16) : 0.45 * window(minute, 10, 16);
      return Math.min(1, morning + evening + midday);
    }
    case "warehouse":
      if (workday) return window(minute, 6.5, 22);
      return weekday === 6 ? 0.5 * window(minute, 6.5, 14) : 0;
    case "clinic":
      if (workday) return window(minute, 7.5, 19);
      return weekday === 6 ? 0.6 * window(minute, 8.5, 13) : 0;
    case "library":
      if (day.holiday) return 0;
      if (workday) return window(minute, 9.5, 20);
      return weekday === 6 ? window(minute, 10.5, 17) : 0.5 * window(minute, 13.5, 17);
    case "lab":
      if (workday) return window(minute, 8.5, 18);
      return 0.2 * window(minute, 10.5, 16);
  }
}

/** Mean occupancy of a whole local day (sampled every 15 minutes of wall clock). */
export function dailyOccupancy(useType: UseType, day: LocalDay): number {
  let sum = 0;
  for (let m = 0; m < 1440; m += 15) sum += occupancyFraction(useType, day, m);
  return sum / 96;
}
