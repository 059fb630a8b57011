/** Text of the demo's input files (everything except weather, which weather.ts writes). */
import type { ZoneCalendar } from "./calendar.ts";
import { formatLocalClock, formatLocalWithOffset } from "./calendar.ts";
import type { DemoBill } from "./bills.ts";
import { csvText, fixed, money, scaledIntText } from "./csv.ts";
import type { BuildingDef, MeterDef } from "./definition.ts";
import { AS_OF, COMPANY_NAME, stationOf } from "./definition.ts";
import type { MeterSeries } from "./metering.ts";
import { intervalRange } from "./metering.ts";

/** portfolio.yaml: settings of the invented company. */
export function portfolioYaml(): string {
  return `# Demo portfolio of an invented company, written by scripts/generate-demo.ts.
# Do not edit by hand: run \`npx tsx scripts/generate-demo.ts\` to regenerate.
name: ${COMPANY_NAME}
currency: USD
as_of: ${AS_OF}
forecast_months: 12
escalation: { electricity: 3%, gas: 4%, water: 5% }
tolerances: { usage_pct: 2, demand_pct: 3, cost_abs: 1.00, cost_pct: 0.5 }
degree_day_base: { heating: 18, cooling: 18, unit: C }
base_path: /
contacts: { ashelm: "Resident services, ground-floor office: 555-0148, residents@ashelm.example" }
`;
}

export function buildingsCsv(buildings: BuildingDef[]): string {
  return csvText(
    ["building_id", "name", "floor_area", "area_unit", "timezone", "weather_station", "use_type", "tenant_page"],
    buildings.map((b) => [b.buildingId, b.name, b.floorArea, b.areaUnit, stationOf(b).zone, b.stationId, b.useType, b.tenantPage ? "yes" : ""]),
  );
}

export function metersCsv(meters: MeterDef[]): string {
  return csvText(
    ["meter_id", "building_id", "commodity", "unit", "tariff", "multiplier", "account"],
    meters.map((m) => [m.meterId, m.buildingId, m.commodity, m.unit, m.tariffId, m.multiplier, m.account]),
  );
}

export function billsCsv(bills: DemoBill[]): string {
  return csvText(
    ["meter_id", "bill_id", "period_start", "period_end", "usage", "read_type", "demand", "power_factor", "total", "statement_date"],
    bills.map((b) => [
      b.meterId,
      b.billId,
      b.periodStart,
      b.periodEnd,
      b.usageText,
      b.readType,
      b.demandText,
      b.powerFactor === null ? null : fixed(b.powerFactor, 2),
      money(b.total),
      b.statementDate,
    ]),
  );
}

export function billLinesCsv(bills: DemoBill[]): string {
  const rows: string[][] = [];
  for (const b of bills) for (const l of b.lines) rows.push([b.billId, l.label, money(l.amount)]);
  return csvText(["bill_id", "label", "amount"], rows);
}

/**
 * Interval CSV text(s) of one meter for local dates [from, to): one file, or one per local year.
 * Returns file name (under intervals/) → text.
 */
export function intervalFiles(series: MeterSeries, from: string, to: string): Map<string, string> {
  const meter = series.meter;
  if (!meter.interval || !series.counts) throw new Error(`demo: ${meter.meterId} is not an interval meter`);
  const { decimals, layout } = meter.interval;
  const cal: ZoneCalendar = series.cal;
  const [i0, i1] = intervalRange(cal, from, to);
  const byFile = new Map<string, string[]>();
  for (let i = i0; i < i1; i++) {
    const day = cal.days[cal.intervalDay[i]];
    const name = layout === "offset-split-by-year" ? `${meter.meterId}-${day.year}.csv` : `${meter.meterId}.csv`;
    let rows = byFile.get(name);
    if (!rows) {
      rows = ["meter_id,timestamp,value"];
      byFile.set(name, rows);
    }
    const ts =
      layout === "local-no-offset"
        ? formatLocalClock(day.date, cal.clockMinute[i])
        : formatLocalWithOffset(day.date, cal.clockMinute[i], cal.offsetMinutes[i]);
    rows.push(`${meter.meterId},${ts},${scaledIntText(series.counts[i], decimals)}`);
  }
  return new Map([...byFile].map(([k, rows]) => [k, rows.join("\n") + "\n"]));
}
