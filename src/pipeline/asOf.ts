/**
 * `as_of` is "the last day of data used" (inputs.md): bills that run past it and interval and
 * weather readings after it are left out of the audit, the models and the forecast, each with a
 * warning saying how much and how to include it. Pure: returns a new portfolio.
 */
import type { InputIssue } from "../core/issues.ts";
import type { Bill, IntervalSeries, Portfolio, WeatherSeries } from "../domain/types.ts";
import { addDays, localMidnightMs } from "../core/time/index.ts";
import { lowerBound } from "../core/sorted.ts";
import { expectedProblem } from "../core/errors.ts";

/** The widest zone offset from UTC (hours): weather after as_of is cut at as_of + 1 day + this, so no zone loses a reading of its own as_of day. */
const MAX_ZONE_OFFSET_HOURS = 14;

/**
 * The portfolio cut at `settings.asOf` (unchanged without one), and a warning per meter whose
 * bills or readings were left out.
 * @example cutAtAsOf(p).portfolio.bills.every((b) => b.periodEnd <= addDays(p.settings.asOf!, 1))
 */
export function cutAtAsOf<T>(portfolio: Portfolio<T>): { portfolio: Portfolio<T>; issues: InputIssue[] } {
  const asOf = portfolio.settings.asOf;
  if (!asOf) return { portfolio, issues: [] };
  const end = addDays(asOf, 1); // bills are half-open: period_end = as_of + 1 means the last day billed is as_of
  const issues: InputIssue[] = [];
  const late = new Map<string, Bill[]>();
  const bills = portfolio.bills.filter((b) => {
    if (b.periodEnd <= end) return true;
    const list = late.get(b.meterId);
    if (list) list.push(b);
    else late.set(b.meterId, [b]);
    return false;
  });
  for (const [meterId, list] of late) {
    issues.push({
      file: list[0].source.file,
      line: list[0].source.line,
      column: 0,
      severity: "warning",
      message: `${list.length} bill(s) of meter ${meterId} run past as_of ${asOf} (first: ${list[0].billId}, ${list[0].periodStart} to ${list[0].periodEnd}) and were left out of the audit, the models and the forecast`,
      hint: "as_of in portfolio.yaml is the last day of data used; move it later (or remove it) to include them",
    });
  }
  const kept = new Set(bills.map((b) => b.billId));
  const zoneOf = new Map(portfolio.buildings.map((b) => [b.buildingId, b.timezone]));
  const meterZone = new Map(portfolio.meters.map((m) => [m.meterId, zoneOf.get(m.buildingId)]));
  const intervals = new Map<string, IntervalSeries>();
  for (const [meterId, s] of portfolio.intervals) {
    const zone = meterZone.get(meterId);
    let cut = s.startMs.length;
    try {
      if (zone) cut = lowerBound(s.startMs, localMidnightMs(end, zone));
    } catch (error) {
      expectedProblem(error);
      cut = s.startMs.length; // an unusable zone is reported by ingest
    }
    if (cut === s.startMs.length) {
      intervals.set(meterId, s);
      continue;
    }
    intervals.set(meterId, { ...s, startMs: s.startMs.slice(0, cut), values: s.values.slice(0, cut) });
    issues.push({
      file: "portfolio.yaml",
      line: 0,
      column: 0,
      severity: "warning",
      message: `${s.startMs.length - cut} interval reading(s) of meter ${meterId} after as_of ${asOf} were left out`,
      hint: "as_of in portfolio.yaml is the last day of data used; move it later (or remove it) to include them",
    });
  }
  const weatherEndMs = Date.parse(`${end}T00:00:00Z`) + MAX_ZONE_OFFSET_HOURS * 3_600_000;
  const weather = new Map<string, WeatherSeries>();
  for (const [id, w] of portfolio.weather) {
    const hours = Math.max(0, Math.min(w.tempC.length, Math.floor((weatherEndMs - w.startMs) / 3_600_000)));
    weather.set(id, hours === w.tempC.length ? w : { ...w, tempC: w.tempC.slice(0, hours), filled: w.filled.slice(0, hours) });
  }
  return {
    portfolio: { ...portfolio, bills, billLines: portfolio.billLines.filter((l) => kept.has(l.billId)), intervals, weather },
    issues,
  };
}
