/**
 * `ohmbook import espi FILE… --into DIR --building ID [--timezone ZONE] [--tariff ID]`:
 * option parsing and the printed summary; the work is in src/import/espi/importEspi.ts.
 */
import { parseArgs } from "node:util";
import { UsageError } from "../core/errors.ts";
import { formatIssue } from "../core/issues.ts";

const IMPORT_USAGE = `Usage: ohmbook import espi FILE... --into DIR --building ID [--timezone ZONE] [--tariff ID]
                          [--name TEXT] [--floor-area N] [--weather-station ID] [--quiet] [--json]

Adds the usage points of ESPI ("Green Button") XML files to the portfolio folder DIR:
one meter per usage point and reading type (meters.csv; id BUILDING-E|G|W-<8 hex>, the same on
every import), interval rows of 5 to 60 minutes under DIR/intervals/, and one bills.csv row (with
bill_lines.csv rows for cost details) per usage summary that states a bill amount. Importing the
same data again adds nothing.

Options:
  --into DIR             the portfolio folder (must hold portfolio.yaml)
  --building ID          the building the meters belong to; added to buildings.csv when missing
  --timezone ZONE        IANA zone of a new building (required then), e.g. America/New_York
  --tariff ID            tariff id written on new meters (else left empty, with a warning)
  --name, --floor-area, --weather-station   the other cells of a new building's row
  --quiet                print only errors
  --json                 print the import report as JSON (warnings included)
  -h, --help             show this help

Exit codes: 0 imported (or nothing new); 1 a file cannot be mapped (file:line messages; nothing written).`;

export interface ImportIo {
  out: (s: string) => void;
  err: (s: string) => void;
}

/** Runs `ohmbook import …` with the arguments after `import`; returns the exit code. */
export async function runImport(args: string[], io: ImportIo): Promise<number> {
  let parsed;
  try {
    parsed = parseArgs({
      args,
      allowPositionals: true,
      strict: true,
      options: {
        into: { type: "string" },
        building: { type: "string" },
        timezone: { type: "string" },
        tariff: { type: "string" },
        name: { type: "string" },
        "floor-area": { type: "string" },
        "weather-station": { type: "string" },
        quiet: { type: "boolean", short: "q" },
        json: { type: "boolean" },
        help: { type: "boolean", short: "h" },
      },
    });
  } catch (error) {
    throw new UsageError(`${(error as Error).message}\n\n${IMPORT_USAGE}`);
  }
  const { values, positionals } = parsed;
  if (values.help) {
    io.out(`${IMPORT_USAGE}\n`);
    return 0;
  }
  const [format, ...files] = positionals;
  if (format !== "espi") throw new UsageError(format === undefined ? `import needs a format: ohmbook import espi FILE...\n\n${IMPORT_USAGE}` : `unknown import format '${format}'; the one known is 'espi'`);
  if (files.length === 0) throw new UsageError("import espi needs at least one FILE (a Green Button XML file)");
  if (values.into === undefined) throw new UsageError("import espi needs --into DIR (the portfolio folder)");
  if (values.building === undefined) throw new UsageError("import espi needs --building ID");
  const floorArea = values["floor-area"];
  if (floorArea !== undefined && !(/^\d+(\.\d+)?$/.test(floorArea) && Number(floorArea) > 0)) {
    throw new UsageError(`--floor-area '${floorArea}' must be a number greater than 0 (digits and a '.' only)`);
  }
  const { importEspi } = await import("../import/index.ts");
  const result = await importEspi({
    files,
    intoDir: values.into,
    buildingId: values.building,
    timezone: values.timezone,
    tariff: values.tariff,
    buildingName: values.name,
    floorArea,
    weatherStation: values["weather-station"],
  });
  if (values.json) {
    io.out(`${JSON.stringify(result, null, 2)}\n`);
    return 0;
  }
  if (values.quiet) return 0;
  for (const w of result.warnings) io.err(`${formatIssue(w)}\n`);
  for (const f of result.files) {
    for (const m of f.meters) {
      io.out(`${f.file}: meter ${m.meterId} (${m.commodity}, ${m.unit})${m.isNew ? " added" : ""}: ${m.added} interval row(s) added, ${m.alreadyPresent} already there; total ${m.intervalTotal} ${m.unit} in ${m.intervalReadings} interval(s)\n`);
    }
    for (const b of f.bills) io.out(`${f.file}: bill ${b.billId} ${b.periodStart} to ${b.periodEnd}, ${b.usage}, total ${b.total}${b.added ? " added" : " already there"}\n`);
  }
  const nothing = result.metersAdded + result.billsAdded + result.intervalRowsAdded + result.billLinesAdded === 0 && !result.buildingCreated;
  io.out(nothing
    ? `Nothing new: ${values.into} already holds this data.\n`
    : `Imported into ${values.into}: ${result.buildingCreated ? "1 building, " : ""}${result.metersAdded} meter(s), ${result.intervalRowsAdded} interval row(s), ${result.billsAdded} bill(s), ${result.billLinesAdded} bill line(s). Next: ohmbook check ${values.into}\n`);
  return 0;
}
