/**
 * Time for every folder: zones and offsets, UTC ↔ local wall clock, local days and months,
 * hour of week, calendar-date arithmetic, spreading periods over months, holidays, and dates
 * as people read them. Nothing outside this folder imports luxon or formats dates with Intl.
 */
export { isValidZone, assertValidZone, zoneOffsetMs, offsetAtMs, offsetSegments, type OffsetSegment } from "./zone.ts";
export {
  civilDay, localMs, localClockMs, localPartsOf, localDateOf, localTimes, hoursOfWeek, intervalOfWeek, hourOfWeek,
  type LocalDay, type LocalParts, type LocalTimes,
} from "./local.ts";
export { LocalTimeResolver, sharedResolver, localMidnightMs, type LocalTimeKind } from "./toUtc.ts";
export { daysBetween, addDays, isoDateToDayNumber, dayNumberToIsoDate, isIsoDate } from "./dates.ts";
export {
  daysInMonth, addMonthsIso, shiftMonth, calendarMonth, monthsAfter, spreadOverMonths, LocalMonthCalendar,
  type CalendarMonth, type MonthPart, type LocalMonth,
} from "./months.ts";
export { usFederalHolidays, isUsFederalHoliday } from "./holidays.ts";
export { formatDate, formatMonth, formatLocalDateTime, isoWithOffset } from "./display.ts";
