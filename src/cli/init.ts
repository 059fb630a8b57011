/**
 * `ohmbook init DIR`: writes a small, commented starter portfolio that passes `ohmbook check`
 * and builds, so a new user can see every file of the input contract and edit from there.
 * The data is a fictional single building; the weather is a smooth synthetic year.
 */
import { mkdir, writeFile, readdir } from "node:fs/promises";
import { describeFsError } from "../ingest/index.ts";
import { join } from "node:path";
import { DateTime } from "luxon";
import { OhmbookError } from "../core/errors.ts";

const PORTFOLIO_YAML = `# Portfolio settings. Only "name" is required; everything else has a default.
name: Starter Portfolio            # shown on every page
currency: USD                      # ISO 4217 code of every amount in bills.csv
# as_of: 2025-06-30                # last day of data to use (default: last bill end)
forecast_months: 12                # horizon of the cost forecast
escalation: { electricity: 3%, gas: 4%, water: 5% }   # yearly price drift after the last tariff version
tolerances: { usage_pct: 2, demand_pct: 3, cost_abs: 1.00, cost_pct: 0.5 }
degree_day_base: { heating: 18, cooling: 18, unit: C }
base_path: /                       # URL prefix if the site is hosted below a domain root
`;

const README_TXT = `Starter portfolio written by 'ohmbook init'.

Files (see the ohmbook README for every column):
  portfolio.yaml   settings
  buildings.csv    one row per building (floor area, IANA time zone, weather station)
  meters.csv       one row per meter; 'tariff' names the id of a file in tariffs/
  bills.csv        one row per bill; period_end is the next read date (not included)
  weather/         hourly outdoor temperature per station (timestamps with UTC offset)
  tariffs/         tariff files, one YAML file per rate schedule

Try:  ohmbook check .   then   ohmbook build . --out site
`;

const TARIFF_YAML = `# A simple small-commercial electricity tariff. Rates are per kWh unless stated.
id: starter-electric
name: Starter Electric small commercial
commodity: electricity
usage_unit: kWh
currency: USD
versions:
  - from: 2024-01-01
    charges:
      - label: Customer charge       # per bill
        fixed: 15.00
      - label: Energy                # every kWh
        energy: 0.12
      - label: Sales tax             # percent of every line above
        percent: 5
`;

interface StarterBill {
  start: string;
  end: string;
  kwh: number;
}

const STARTER_BILLS: StarterBill[] = [
  { start: "2024-01-03", end: "2024-02-02", kwh: 11840 },
  { start: "2024-02-02", end: "2024-03-04", kwh: 10920 },
  { start: "2024-03-04", end: "2024-04-03", kwh: 10110 },
  { start: "2024-04-03", end: "2024-05-02", kwh: 9870 },
  { start: "2024-05-02", end: "2024-06-03", kwh: 11260 },
  { start: "2024-06-03", end: "2024-07-02", kwh: 12980 },
];

/** Half-up to the cent, like the tariff engine (avoids binary artefacts with a small epsilon). */
function roundCents(amount: number): number {
  return Math.sign(amount) * Math.floor(Math.abs(amount) * 100 + 0.5 + 1e-9) / 100;
}

function starterBillsCsv(): string {
  const rows = STARTER_BILLS.map((b) => {
    const customer = 15;
    const energy = roundCents(b.kwh * 0.12);
    const tax = roundCents((customer + energy) * 0.05);
    const total = roundCents(customer + energy + tax);
    return `STARTER-E1,${b.start},${b.end},${b.kwh},actual,${total.toFixed(2)}`;
  });
  return ["meter_id,period_start,period_end,usage,read_type,total", ...rows].join("\n") + "\n";
}

/** Smooth synthetic hourly weather: seasonal and daily sine waves, in °C, with UTC offsets. */
function starterWeatherCsv(): string {
  const lines = ["station_id,timestamp,temperature_c"];
  let t = DateTime.fromISO("2023-12-31T00:00:00", { zone: "America/Chicago" });
  const end = DateTime.fromISO("2024-07-03T00:00:00", { zone: "America/Chicago" });
  while (t < end) {
    const dayOfYear = t.ordinal;
    const seasonal = 12 - 14 * Math.cos(((dayOfYear - 15) / 365) * 2 * Math.PI);
    const daily = 5 * Math.sin(((t.hour - 9) / 24) * 2 * Math.PI);
    lines.push(`STARTER-WX,${t.toISO({ suppressMilliseconds: true })},${(seasonal + daily).toFixed(1)}`);
    t = t.plus({ hours: 1 });
  }
  return lines.join("\n") + "\n";
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
  const files: Record<string, string> = {
    "README.txt": README_TXT,
    "portfolio.yaml": PORTFOLIO_YAML,
    "buildings.csv":
      "building_id,name,floor_area,area_unit,timezone,weather_station,use_type,tenant_page\n" +
      "STARTER-1,Starter Office,42000,ft2,America/Chicago,STARTER-WX,office,yes\n",
    "meters.csv": "meter_id,building_id,commodity,unit,tariff,multiplier,account\nSTARTER-E1,STARTER-1,electricity,kWh,starter-electric,1,000-111-222\n",
    "bills.csv": starterBillsCsv(),
    "weather/starter-wx.csv": starterWeatherCsv(),
    "tariffs/starter-electric.yaml": TARIFF_YAML,
  };
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
