/**
 * `ohmbook init DIR`: writes a small starter portfolio with one example of every input kind of
 * the input contract (shared/spec/inputs.md): portfolio.yaml, buildings.csv, meters.csv,
 * bills.csv, bill_lines.csv, interval data, hourly and daily weather, weather normals, and an
 * electricity, a gas and a water tariff. YAML files carry comments; CSV files cannot (the
 * contract has no comment syntax), so README.txt explains them column by column.
 *
 * Everything is fictional and generated here, deterministically: the temperatures are smooth
 * sine waves; the electricity meter's hourly use follows occupancy and cooling; gas follows
 * heating degree-days; water follows billing days. Each bill's usage is what its meter used,
 * and its total and printed lines are the tariff engine's price of that usage, so the starter
 * checks and builds with no warning and no finding. A user who then edits a bill sees the audit
 * react to that edit alone.
 */
import { mkdir, writeFile, readdir } from "node:fs/promises";
import { join } from "node:path";
import { describeFsError } from "../ingest/index.ts";
import { OhmbookError } from "../core/errors.ts";
import { addDays, daysBetween, isoWithOffset, localMidnightMs, localPartsOf, type LocalParts } from "../core/time/index.ts";
import { loadTariff, priceBill, type ComputedBill, type PriceRequest } from "../tariff/index.ts";

const ZONE = "America/Chicago";
const STATION = "STARTER-WX";

const PORTFOLIO_YAML = `# Portfolio settings (written by 'ohmbook init'; see README.txt beside this file).
# Only "name" is required; every other key has a default.
name: Starter Portfolio            # shown on every page
currency: USD                      # ISO 4217 code of every amount in bills.csv and bill_lines.csv
# as_of: 2024-12-31                # last day of data to use (default: the last bill's end)
forecast_months: 12                # horizon of the cost forecast
escalation: { electricity: 3%, gas: 4%, water: 5% }   # yearly price drift after the last tariff version
# A money difference is a finding only when it exceeds BOTH cost_abs (currency) and cost_pct (%).
tolerances: { usage_pct: 2, demand_pct: 3, cost_abs: 1.00, cost_pct: 0.5 }
degree_day_base: { heating: 18, cooling: 18, unit: C }   # starting points; the models may search
base_path: /                       # URL prefix if the site is hosted below a domain root
`;

const ELECTRIC_TARIFF = `# An electricity tariff: what the utility's rate sheet says, written once per rate schedule.
# meters.csv points at it through its "tariff" column, which must equal "id" below.
# The utility and its prices are fictional.
id: starter-electric
name: Starter Electric, small general service, time of use
commodity: electricity
usage_unit: kWh                    # the unit the prices below are quoted in
currency: USD

versions:
  # ---- in force from 1 January 2024 ----
  - from: 2024-01-01
    seasons:                       # name your seasons; every month in at most one
      summer: Jun-Sep
      winter: Oct-May
    holidays: us-federal           # observed U.S. federal holidays are priced like weekends
    periods:                       # checked top to bottom; the first that matches wins
      on-peak:
        season: summer
        days: weekdays
        hours: "14:00-19:00"       # from 14:00 up to (not including) 19:00, local time
      off-peak: {}                 # an empty period catches every other hour
    charges:                       # one bill line each, priced in this order
      - label: Customer charge
        fixed: 18.00               # per bill
      - label: Energy
        energy: { on-peak: 0.1650, off-peak: 0.0980 }   # per kWh, by time-of-use period
      - label: Demand
        demand: 9.50               # per kW of the highest demand in the billing period
        window_minutes: 60         # the highest 60-minute average
      - label: Power factor adjustment
        power_factor: { target: 0.90 }   # below 0.90, the demand line grows by 0.90/pf - 1
      - label: Sales tax
        percent: 5                 # of every line above it

  # ---- a rate change on 1 July 2024: only what changed is written ----
  - from: 2024-07-01
    inherit: true                  # start from the version above
    charges_override:
      - label: Energy              # same label: replaces that charge in place
        energy: { on-peak: 0.1720, off-peak: 0.1010 }
`;

const GAS_TARIFF = `# A gas tariff with declining blocks. Fictional utility and prices.
id: starter-gas
name: Starter Gas, commercial heating
commodity: gas
usage_unit: therm
currency: USD

versions:
  - from: 2024-01-01
    charges:
      - label: Basic charge
        fixed: 25.00
      - label: Distribution
        blocks:                    # the first 300 therms, then everything above
          - { up_to: 300, rate: 0.6200 }
          - { rate: 0.4800 }
        scale_blocks_by_days: true # the 300-therm limit grows or shrinks with the bill's days / 30
      - label: Gas supply
        energy: 0.3900             # per therm
      - label: Gross receipts tax
        percent: 4
    minimum_bill: 30.00            # if the lines before the tax come to less, a line tops them up
`;

const WATER_TARIFF = `# A water and sewer tariff. Rates are per ccf (100 cubic feet); the meter reads gallons and
# ohmbook converts (1 ccf = 748.052 gal). Fictional utility and prices.
id: starter-water
name: Starter Water and Sewer
commodity: water
usage_unit: ccf
currency: USD

versions:
  - from: 2024-01-01
    charges:
      - label: Meter charge
        fixed: 12.00
      - label: Water
        energy: 4.85               # "energy" is the per-unit charge of any commodity: here per ccf
      - label: Sewer
        energy: 6.10
`;

const README_TXT = `Starter portfolio written by 'ohmbook init'. Everything in it is fictional.

One office building with three meters (electricity with hourly interval data, gas, water),
a year of monthly bills, weather, and one tariff per meter. It checks and builds with no
warning and no audit finding: every bill matches its tariff and its meter. Edit anything
and run the build again to see what ohmbook makes of it (or run 'ohmbook serve .' and
watch the site rebuild on every save).

  ohmbook check .                  validate every file, print file:line:column problems
  ohmbook build . --out ../site    write the site; open ../site/index.html

Files. CSV files have a header row; column order is free; an empty cell is a missing
value; numbers use "." and no thousands separators; dates are YYYY-MM-DD.

portfolio.yaml
  Settings, with a comment on each line.

buildings.csv              one row per building
  building_id      unique key (letters, digits, _ and -)
  name             display name
  floor_area       gross floor area, a number > 0
  area_unit        ft2 (default) or m2
  timezone         IANA zone name; bill dates and local timestamps are read in it
  weather_station  station_id in weather/*.csv
  use_type         free text (office, school, retail, ...)
  tenant_page      yes = also publish a page for the building's tenants

meters.csv                 one row per utility meter or account
  meter_id         unique key
  building_id      a building_id of buildings.csv
  commodity        electricity, gas or water
  unit             the unit bills are in: electricity kWh/MWh; gas therm/ccf/m3/kWh;
                   water gal/ccf/m3
  tariff           the id of a file in tariffs/
  multiplier       meter constant applied to interval data (default 1)
  account          the utility's account number (shown, never used as a key)

bills.csv                  one row per bill
  meter_id         a meter_id of meters.csv
  bill_id          optional; default meter_id:period_start
  period_start     first day of service
  period_end       the next meter-read date: the first day NOT in the bill
  usage            billed usage in the meter's unit
  read_type        actual (default) or estimated
  demand           the maximum demand printed on the bill, kW (electricity)
  power_factor     0 < pf <= 1, when the bill prints it
  total            amount billed, after taxes, in the portfolio's currency
  statement_date   the date on the bill

bill_lines.csv             optional: the charges printed on each bill
  bill_id          a bill_id of bills.csv
  label            the line's name as printed; matched to the tariff charge with the same
                   label (case and spaces ignored)
  amount           the printed amount

intervals/starter-e1.csv   interval meter data (any number of files, any names)
  meter_id         a meter_id of meters.csv
  timestamp        start of the interval, ISO 8601 (with a UTC offset, or local time in
                   the building's zone)
  value            energy used in the interval, in the meter's unit before the multiplier
  (an optional interval_minutes column states the interval length; here it is inferred:
  60 minutes)

weather/starter-wx.csv     hourly outdoor temperature
  station_id, timestamp, temperature_c   (or temperature_f for Fahrenheit)

weather/starter-wx-daily.csv   daily highs and lows, for days without hourly data
  station_id, date, tmax_c, tmin_c       (or tmax_f, tmin_f)
  Where a station has hourly data for a day, hourly wins; this file covers the weeks
  before the hourly file starts.

weather/normals/starter-wx.csv   a typical year of hourly temperatures (8,760 rows), in the
  hourly layout; used to normalise use and for the forecast's typical weather. Without it
  the typical year is built from weather/ history (3 years or more preferred).

tariffs/*.yaml             one file per rate schedule, with comments: a time-of-use
  electricity tariff with a demand charge, a power-factor clause and a mid-year rate
  change; a gas tariff with blocks and a minimum bill; a water and sewer tariff.

The ohmbook documentation (docs/inputs.md and docs/tariffs.md in the ohmbook repository)
describes every column and every tariff key.
`;

/** Meter read dates: each bill runs from one to the next (period_end is not billed). */
const READ_DATES = [
  "2024-01-03", "2024-02-02", "2024-03-04", "2024-04-03", "2024-05-02", "2024-06-03", "2024-07-02",
  "2024-08-01", "2024-09-03", "2024-10-02", "2024-11-01", "2024-12-03", "2025-01-03",
];

const HOUR_MS = 3_600_000;

/** Outdoor temperature, °C, at an instant: a seasonal wave, a daily wave and a slow 9-day swing. */
function temperatureC(ms: number, local: LocalParts, typicalYear: boolean): number {
  const seasonal = 12 - 14 * Math.cos(((local.dayOfYear - 15) / 365) * 2 * Math.PI);
  const daily = 5 * Math.sin(((local.hour - 9) / 24) * 2 * Math.PI);
  // The actual year wanders around the typical one, so normalisation has something to do.
  const swing = typicalYear ? 0 : 2.5 * Math.sin((ms / 86_400_000 / 9) * 2 * Math.PI);
  return Math.round((seasonal + daily + swing) * 10) / 10;
}

interface Hour {
  ms: number;
  local: LocalParts;
  tempC: number;
}

/** Every hour from local midnight of `from` to local midnight of `to` (dates in ZONE), DST-aware (23- and 25-hour days). */
function hours(from: string, to: string): Hour[] {
  const out: Hour[] = [];
  const end = localMidnightMs(to, ZONE);
  for (let ms = localMidnightMs(from, ZONE); ms < end; ms += HOUR_MS) {
    const local = localPartsOf(ms, ZONE);
    out.push({ ms, local, tempC: temperatureC(ms, local, false) });
  }
  return out;
}

/** Whole kWh used in one hour by the office: base load, weekday occupancy, cooling. */
function officeKwh(h: Hour): number {
  const weekday = h.local.isoWeekday <= 5;
  const occupied = weekday && h.local.hour >= 7 && h.local.hour < 19;
  const cooling = Math.max(0, h.tempC - 18) * (occupied ? 4.5 : 2);
  return Math.round(38 + (occupied ? 64 : 0) + cooling);
}

function csv(header: string, rows: readonly (readonly (string | number)[])[]): string {
  return [header, ...rows.map((r) => r.join(","))].join("\n") + "\n";
}

function parseTariff(text: string, file: string) {
  const { tariff, issues } = loadTariff(text, file);
  if (!tariff) throw new Error(`starter tariff ${file} does not load: ${issues.map((i) => i.message).join("; ")}`);
  return tariff;
}

interface StarterBill {
  meterId: string;
  billId: string;
  start: string;
  end: string;
  usage: number;
  demand: number | null;
  powerFactor: number | null;
  priced: ComputedBill;
  statementDate: string;
}

/** The starter's files, by path relative to the portfolio folder. Deterministic. */
export function starterFiles(): Record<string, string> {
  const first = READ_DATES[0]!;
  const last = READ_DATES[READ_DATES.length - 1]!;
  // Hourly weather from a few days before the first bill to a few days after the last.
  const weatherHours = hours("2023-12-29", "2025-01-06");
  const meterHours = hours(first, last);

  const electric = parseTariff(ELECTRIC_TARIFF, "tariffs/starter-electric.yaml");
  const gas = parseTariff(GAS_TARIFF, "tariffs/starter-gas.yaml");
  const water = parseTariff(WATER_TARIFF, "tariffs/starter-water.yaml");

  const kwh = meterHours.map(officeKwh);
  const startMs = Float64Array.from(meterHours.map((h) => h.ms));
  const bills: StarterBill[] = [];
  const dailyMeanC = (from: string, to: string): number[] => {
    const a = localMidnightMs(from, ZONE);
    const b = localMidnightMs(to, ZONE);
    const byDay = new Map<string, number[]>();
    for (const h of weatherHours) {
      if (h.ms < a || h.ms >= b) continue;
      const day = h.local.date;
      byDay.set(day, [...(byDay.get(day) ?? []), h.tempC]);
    }
    return [...byDay.values()].map((v) => v.reduce((s, x) => s + x, 0) / v.length);
  };

  for (let i = 0; i + 1 < READ_DATES.length; i++) {
    const start = READ_DATES[i]!;
    const end = READ_DATES[i + 1]!;
    const days = daysBetween(start, end);
    const statementDate = addDays(end, 5);
    const month = start.slice(0, 7);
    const request = (usage: number, unit: string, extra: Partial<PriceRequest> = {}): PriceRequest => ({ periodStart: start, periodEnd: end, timezone: ZONE, usage, usageUnit: unit, ...extra });

    // Electricity: usage and demand are what the interval data say; every 60-minute value is kW.
    const a = localMidnightMs(start, ZONE);
    const b = localMidnightMs(end, ZONE);
    const idx = meterHours.map((_, k) => k).filter((k) => startMs[k]! >= a && startMs[k]! < b);
    const usage = idx.reduce((s, k) => s + kwh[k]!, 0);
    const demand = Math.max(...idx.map((k) => kwh[k]!));
    // One bill prints a power factor below the tariff's 0.90 target, so the clause shows up.
    const powerFactor = month === "2024-08" ? 0.87 : 0.94;
    const intervals = { startMs: Float64Array.from(idx.map((k) => startMs[k]!)), values: Float64Array.from(idx.map((k) => kwh[k]!)), intervalMinutes: 60 };
    bills.push({
      meterId: "STARTER-E1", billId: `E1-${month}`, start, end, usage, demand, powerFactor, statementDate,
      priced: priceBill(electric, request(usage, "kWh", { demandKw: demand, powerFactor, intervals, intervalsGive: "shape" })),
    });

    // Gas: a little for hot water every day, more on cold days (heating degree-days, base 18 °C).
    const hdd = dailyMeanC(start, end).reduce((s, t) => s + Math.max(0, 18 - t), 0);
    const therms = Math.round(2.4 * days + 1.9 * hdd);
    bills.push({ meterId: "STARTER-G1", billId: `G1-${month}`, start, end, usage: therms, demand: null, powerFactor: null, statementDate, priced: priceBill(gas, request(therms, "therm")) });

    // Water: about 1,850 gallons per billing day.
    const gallons = Math.round(days * 1850 + (i % 3) * 410);
    bills.push({ meterId: "STARTER-W1", billId: `W1-${month}`, start, end, usage: gallons, demand: null, powerFactor: null, statementDate, priced: priceBill(water, request(gallons, "gal")) });
  }
  for (const bill of bills) {
    if (!bill.priced.exact) throw new Error(`starter bill ${bill.billId} is not priced exactly`);
  }

  const billsCsv = csv(
    "meter_id,bill_id,period_start,period_end,usage,read_type,demand,power_factor,total,statement_date",
    bills.map((b) => [b.meterId, b.billId, b.start, b.end, b.usage, "actual", b.demand ?? "", b.powerFactor ?? "", b.priced.total.toFixed(2), b.statementDate]),
  );
  // Printed lines as a utility prints them: every charge with an amount (a zero line is not printed).
  const lineRows = bills.flatMap((b) => b.priced.lines.filter((l) => l.amount !== 0).map((l) => [b.billId, l.label, l.amount.toFixed(2)]));

  const intervalsCsv = csv("meter_id,timestamp,value", meterHours.map((h, k) => ["STARTER-E1", isoWithOffset(h.ms, ZONE), kwh[k]!]));
  const weatherCsv = csv("station_id,timestamp,temperature_c", weatherHours.map((h) => [STATION, isoWithOffset(h.ms, ZONE), h.tempC.toFixed(1)]));

  // Daily highs and lows for the weeks before the hourly file.
  const dailyRows: string[][] = [];
  for (let day = "2023-12-01"; day < "2023-12-29"; day = addDays(day, 1)) {
    const temps = hours(day, addDays(day, 1)).map((h) => h.tempC);
    dailyRows.push([STATION, day, Math.max(...temps).toFixed(1), Math.min(...temps).toFixed(1)]);
  }
  const dailyCsv = csv("station_id,date,tmax_c,tmin_c", dailyRows);

  // A typical (non-leap) year of 8,760 hours, dated 2023 and written in standard time (UTC-6,
  // the IANA zone Etc/GMT+6) so that every hour appears once.
  const normalsRows: string[][] = [];
  const standard = "Etc/GMT+6";
  for (let k = 0, ms = localMidnightMs("2023-01-01", standard); k < 8760; k++, ms += HOUR_MS) {
    normalsRows.push([STATION, isoWithOffset(ms, standard), temperatureC(ms, localPartsOf(ms, standard), true).toFixed(1)]);
  }
  const normalsCsv = csv("station_id,timestamp,temperature_c", normalsRows);

  return {
    "README.txt": README_TXT,
    "portfolio.yaml": PORTFOLIO_YAML,
    "buildings.csv": csv("building_id,name,floor_area,area_unit,timezone,weather_station,use_type,tenant_page", [
      ["STARTER-1", "Starter Office", 42000, "ft2", ZONE, STATION, "office", "yes"],
    ]),
    "meters.csv": csv("meter_id,building_id,commodity,unit,tariff,multiplier,account", [
      ["STARTER-E1", "STARTER-1", "electricity", "kWh", "starter-electric", 1, "000-111-222"],
      ["STARTER-G1", "STARTER-1", "gas", "therm", "starter-gas", 1, "000-111-333"],
      ["STARTER-W1", "STARTER-1", "water", "gal", "starter-water", 1, "000-111-444"],
    ]),
    "bills.csv": billsCsv,
    "bill_lines.csv": csv("bill_id,label,amount", lineRows),
    "intervals/starter-e1.csv": intervalsCsv,
    "weather/starter-wx.csv": weatherCsv,
    "weather/starter-wx-daily.csv": dailyCsv,
    "weather/normals/starter-wx.csv": normalsCsv,
    "tariffs/starter-electric.yaml": ELECTRIC_TARIFF,
    "tariffs/starter-gas.yaml": GAS_TARIFF,
    "tariffs/starter-water.yaml": WATER_TARIFF,
  };
}

/**
 * Writes the starter files into `dir` (created if needed).
 * @throws OhmbookError when `dir` exists and is not empty (never overwrites a user's files).
 * @returns the relative paths written.
 */
export async function writeStarterPortfolio(dir: string): Promise<string[]> {
  const existing = await readdir(dir).catch((err: { code?: string }) => {
    if (err.code === "ENOENT") return [] as string[];
    // A file, or a folder we may not read: never a stack trace for a user's mistake.
    throw new OhmbookError(err.code === "ENOTDIR" ? `${dir} is a file, not a folder; choose a new folder` : `cannot use ${dir}: ${describeFsError(err)}`);
  });
  if (existing.length > 0) {
    throw new OhmbookError(`${dir} is not empty; choose a new folder so no file is overwritten`);
  }
  const files = starterFiles();
  for (const [name, text] of Object.entries(files)) {
    const path = join(dir, name);
    try {
      await mkdir(join(path, ".."), { recursive: true });
      await writeFile(path, text, "utf8");
    } catch (err) {
      throw new OhmbookError(`cannot write ${path}: ${describeFsError(err)}`, { cause: err });
    }
  }
  return Object.keys(files);
}
