/**
 * `ohmbook price`: prices one bill from a tariff file and prints every line and the total.
 *
 *   ohmbook price --tariff FILE --usage N --from D --to D [--demand KW] [--pf PF] [--unit U]
 *   ohmbook price --tariff FILE --intervals CSV --meter ID --from D --to D [--multiplier M]
 *   common: [--timezone Z] [--previous-demands KW,KW,…] [--json]
 *
 * Dates are the first day of service and the first day not billed (as on bills.csv).
 * Time zone: interval timestamps without an offset, time-of-use periods and holidays are read in
 * --timezone; the default is UTC so that a result never depends on the machine it runs on.
 */
import { readFile } from "node:fs/promises";
import { parseArgs } from "node:util";
import { isIsoDate, isValidZone, localMidnightMs } from "../core/time/index.ts";
import { InputError, OhmbookError, UsageError } from "../core/errors.ts";
import { formatIssue } from "../core/issues.ts";
import { loadTariff } from "../tariff/index.ts";
import { priceBill } from "../tariff/index.ts";
import type { Tariff } from "../tariff/index.ts";
import type { ComputedBill, ComputedLine, IntervalUsage, PriceRequest } from "../tariff/index.ts";

export interface PriceIo {
  out: (s: string) => void;
  err: (s: string) => void;
}

const USAGE = `usage: ohmbook price --tariff FILE (--usage N --from D --to D [--demand KW] [--pf PF] [--unit U]
                     | --intervals CSV --meter ID --from D --to D [--multiplier M] [--unit U]
                       [--timestamps start|end])
                     [--timezone ZONE] [--previous-demands KW,KW,...] [--estimate] [--json]
  --from D / --to D   first day of service / first day not billed (YYYY-MM-DD)
  --timezone ZONE     IANA zone for time-of-use periods, holidays and interval timestamps
                      without an offset (default UTC)
  --timestamps        whether interval timestamps mark the interval start (default) or end
  --previous-demands  billing demands of earlier bills, oldest first, for ratchets
  --estimate          price even when the tariff needs a demand or power factor that is not
                      given (no demand prices 0 kW; no power factor, no adjustment)
Exit codes: 0 priced; 1 usage, tariff-file or pricing error, or a needed input missing.`;

/**
 * What the tariff versions in force over [from, to) need that the request does not give: a
 * demand (demand charges, without interval data) and a power factor (power-factor charges).
 * Time-of-use lines without interval data are not listed: they are priced from the hours of each
 * period and marked "needs interval data" (docs/tariffs.md, "How a bill is priced").
 * Empty when nothing is missing.
 * @example missingInputs(tariff, "2025-06-01", "2025-07-01", { demand: false, pf: false, intervals: false })
 */
function missingInputs(tariff: Tariff, from: string, to: string, given: { demand: boolean; pf: boolean; intervals: boolean }): string[] {
  const missing = new Set<string>();
  for (const v of tariff.versions) {
    if (v.from >= to || (v.until !== null && v.until <= from)) continue;
    for (const c of v.charges) {
      if (c.kind === "demand" && !given.demand && !given.intervals) missing.add("--demand KW (the tariff has a demand charge)");
      if (c.kind === "power-factor" && !given.pf) missing.add("--pf PF (the tariff has a power-factor charge)");
    }
  }
  return [...missing];
}

import { MAX_BILL_USAGE, readMeterIntervalFile } from "../ingest/index.ts";

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

function num(name: string, s: string | undefined, rule: (n: number) => boolean = () => true, ruleText = ""): number | undefined {
  if (s === undefined) return undefined;
  if (!NUMBER.test(s.trim())) throw new UsageError(`--${name} '${s}' is not a number (write digits with a '.' decimal point, no separators or units)`);
  const n = Number(s);
  // the same plausibility limit as a bill's usage at ingest: beyond it, sums lose their cents or overflow to Infinity
  if (!Number.isFinite(n) || Math.abs(n) > MAX_BILL_USAGE) throw new UsageError(`--${name} ${s.slice(0, 40)} is beyond ±${MAX_BILL_USAGE.toExponential()}, the plausibility limit of a bill's figures (docs/inputs.md, "Limits")`);
  if (!rule(n)) throw new UsageError(`--${name} ${s} is out of range${ruleText ? `: ${ruleText}` : ""}`);
  return n;
}

function date(name: string, s: string | undefined): string {
  if (s === undefined) throw new UsageError(`--${name} is required (YYYY-MM-DD)\n${USAGE}`);
  if (!/^\d{4}-\d{2}-\d{2}$/.test(s) || !isIsoDate(s)) throw new UsageError(`--${name} '${s}' is not a date written YYYY-MM-DD`);
  return s;
}

/**
 * The first timestamp without a UTC offset in an interval file, as file:line:column text, or null.
 * Without --timezone such a timestamp has no defined instant, so `price` asks for the zone rather
 * than assume one.
 */
function firstOffsetlessTimestamp(text: string, file: string): string | null {
  const lines = text.split(/\r\n|\n|\r/);
  const header = (lines[0] ?? "").replace(/^\uFEFF/, "").split(",").map((h) => h.trim().toLowerCase());
  const col = header.indexOf("timestamp");
  if (col < 0) return null;
  for (let i = 1; i < lines.length; i++) {
    const cells = lines[i]!.split(",");
    const ts = (cells[col] ?? "").trim().replace(/^"|"$/g, "");
    if (ts === "") continue;
    if (!/(Z|[+-]\d{2}:?\d{2})$/i.test(ts)) return `${file}:${i + 1}:${cells.slice(0, col).join(",").length + (col > 0 ? 2 : 1)}: timestamp '${ts.slice(0, 40)}' has no UTC offset`;
  }
  return null;
}


function money(n: number): string {
  return n.toLocaleString("en-US", { minimumFractionDigits: 2, maximumFractionDigits: 2 });
}

function qty(n: number | null): string {
  return n === null ? "" : n.toLocaleString("en-US", { maximumFractionDigits: 4 });
}

function rateText(l: ComputedLine): string {
  if (l.rate === null) return "see note";
  if (l.kind === "percent") return `${Number((l.rate * 100).toFixed(6))}%`;
  if (l.kind === "power-factor") return `× ${Number(l.rate.toFixed(6))}`;
  if (l.kind === "fixed" || l.kind === "minimum-bill") return money(l.rate);
  return String(Number(l.rate.toFixed(6)));
}

const STATUS_TEXT: Record<string, string> = { exact: "", estimated: "[estimated] ", "needs-interval-data": "[needs interval data] " };

/** The computed bill as an aligned plain-text table (label, quantity, unit, rate, amount, note) and total. */
function formatBillTable(tariff: Tariff, req: PriceRequest, bill: ComputedBill): string {
  const rows = bill.lines.map((l) => [l.label, qty(l.quantity), l.unit, rateText(l), money(l.amount), `${STATUS_TEXT[l.status]}${l.note ?? ""}`]);
  const head = ["Charge", "Quantity", "Unit", "Rate", `Amount (${tariff.currency})`, "Note"];
  const all = [head, ...rows, ["Total", "", "", "", money(bill.total), bill.exact ? "" : "not exact: see the marked lines"]];
  const widths = head.map((_, c) => Math.max(...all.map((r) => r[c].length)));
  const right = [false, true, false, true, true, false];
  const fmtRow = (r: string[]): string =>
    r
      .map((cell, c) => (c === r.length - 1 ? cell : right[c] ? cell.padStart(widths[c]) : cell.padEnd(widths[c])))
      .join("  ")
      .trimEnd();
  const rule = widths.slice(0, 5).map((w) => "-".repeat(w)).join("  ");
  const days = bill.versions.reduce((s, v) => s + v.days, 0);
  const out = [
    `${tariff.name} (${tariff.id})`,
    `Billing period ${req.periodStart} to ${req.periodEnd} (${days} days), time zone ${req.timezone}`,
    `Usage ${qty(req.usage)} ${req.usageUnit}${req.demandKw != null ? `, demand ${qty(req.demandKw)} kW` : ""}${req.powerFactor != null ? `, power factor ${req.powerFactor}` : ""}${req.intervals ? `, ${req.intervals.startMs.length} intervals` : ""}`,
    `Tariff version(s): ${bill.versions.map((v) => `from ${v.from}, ${v.days} days`).join("; ")}`,
    "",
    fmtRow(head),
    rule,
    ...rows.map(fmtRow),
    rule,
    fmtRow(all[all.length - 1]),
  ];
  if (bill.billingDemandKw !== null) out.push("", `Billing demand: ${qty(bill.billingDemandKw)} kW`);
  if (bill.notes.length > 0) out.push("", ...bill.notes.map((n) => `- ${n}`));
  return `${out.join("\n")}\n`;
}

async function readText(path: string, what: string): Promise<string> {
  try {
    return await readFile(path, "utf8");
  } catch (e) {
    throw new UsageError(`cannot read ${what} '${path}': ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
  }
}

/**
 * Runs `ohmbook price` with the arguments after the command name.
 *
 * @returns exit code: 0 priced; 1 usage, tariff-file or pricing error (message on `io.err`)
 */
export async function runPrice(argv: string[], io: PriceIo): Promise<number> {
  try {
    return await price(argv, io);
  } catch (e) {
    if (e instanceof OhmbookError) {
      io.err(`ohmbook price: ${e.message}\n`);
      return 1;
    }
    io.err(`ohmbook price: unexpected error: ${e instanceof Error ? e.message : String(e)}\n`);
    return 1;
  }
}

async function price(argv: string[], io: PriceIo): Promise<number> {
  let values: Record<string, string | boolean | undefined>;
  try {
    ({ values } = parseArgs({
      args: argv,
      strict: true,
      allowPositionals: false,
      options: {
        tariff: { type: "string" },
        usage: { type: "string" },
        from: { type: "string" },
        to: { type: "string" },
        demand: { type: "string" },
        pf: { type: "string" },
        unit: { type: "string" },
        intervals: { type: "string" },
        meter: { type: "string" },
        multiplier: { type: "string" },
        timezone: { type: "string" },
        "previous-demands": { type: "string" },
        timestamps: { type: "string" },
        json: { type: "boolean" },
        estimate: { type: "boolean" },
        help: { type: "boolean", short: "h" },
      },
    }));
  } catch (e) {
    throw new UsageError(`${(e as Error).message}\n${USAGE}`);
  }
  const s = (k: string): string | undefined => values[k] as string | undefined;
  if (values.help) {
    io.out(`${USAGE}\n`);
    return 0;
  }
  const tariffPath = s("tariff");
  if (!tariffPath) throw new UsageError(`--tariff is required\n${USAGE}`);
  if (s("usage") === undefined && s("intervals") === undefined) throw new UsageError(`give --usage N or --intervals CSV --meter ID\n${USAGE}`);
  if (s("intervals") !== undefined && !s("meter")) throw new UsageError("--intervals needs --meter ID (the meter_id whose rows to use)");
  if (s("intervals") === undefined && (s("meter") !== undefined || s("multiplier") !== undefined || s("timestamps") !== undefined)) {
    throw new UsageError("--meter, --multiplier and --timestamps apply only with --intervals");
  }
  const from = date("from", s("from"));
  const to = date("to", s("to"));
  if (to <= from) throw new UsageError(`--to ${to} must be after --from ${from} (--to is the first day not billed)`);
  const timezone = s("timezone") ?? "UTC";
  if (!isValidZone(timezone)) throw new UsageError(`--timezone '${timezone}' is not an IANA zone name (e.g. America/Chicago)`);
  const demandKw = num("demand", s("demand"), (n) => n >= 0, "demand must be 0 or more kW");
  const pf = num("pf", s("pf"), (n) => n > 0 && n <= 1, "0 < pf <= 1");
  const multiplier = num("multiplier", s("multiplier"), (n) => n > 0, "must be positive") ?? 1;
  const previous = s("previous-demands");
  const previousBillingDemandsKw = previous === undefined ? [] : previous.split(",").map((p) => num("previous-demands", p.trim(), (n) => n >= 0) as number);

  const { tariff, issues } = loadTariff(await readText(tariffPath, "tariff file"), tariffPath);
  for (const issue of issues) io.err(`${formatIssue(issue)}\n`);
  if (!tariff) {
    io.err(`ohmbook price: the tariff file has ${issues.filter((i) => i.severity === "error").length} error(s); nothing priced\n`);
    return 1;
  }
  const unit = s("unit") ?? tariff.usageUnit;

  let intervals: IntervalUsage | null = null;
  let usage = num("usage", s("usage"));
  const csvPath = s("intervals");
  if (csvPath !== undefined) {
    const stamps = s("timestamps") ?? "start";
    if (stamps !== "start" && stamps !== "end") throw new UsageError(`--timestamps must be start or end, got '${stamps}'`);
    const text = await readText(csvPath, "interval file");
    if (s("timezone") === undefined) {
      const where = firstOffsetlessTimestamp(text, csvPath);
      if (where) throw new UsageError(`${where}; pass --timezone ZONE (the building's IANA zone, e.g. America/Chicago) so local times are read as such, or write each timestamp with its offset`);
    }
    const meterId = s("meter") as string;
    const read = await readMeterIntervalFile(csvPath, { fileLabel: csvPath, meterId, zone: timezone, stamp: stamps });
    const errors = read.issues.filter((x) => x.severity === "error");
    for (const w of read.issues.filter((x) => x.severity === "warning")) io.err(`${formatIssue(w)}\n`);
    if (errors.length > 0) throw new InputError(errors);
    if (read.series === null) {
      throw new UsageError(`${csvPath}: no rows for meter '${meterId}'; meters in the file: ${read.otherMeters.slice(0, 10).join(", ") || "none"}`);
    }
    // The series is a regular grid; a missing reading is NaN there and simply has no interval here.
    const keep: number[] = [];
    read.series.values.forEach((v, i) => { if (Number.isFinite(v)) keep.push(i); });
    intervals = {
      startMs: Float64Array.from(keep, (i) => read.series!.startMs[i]!),
      values: Float64Array.from(keep, (i) => read.series!.values[i]! * multiplier),
      intervalMinutes: read.series.intervalMinutes,
    };
    const startMs = localMidnightMs(from, timezone);
    const endMs = localMidnightMs(to, timezone);
    let inPeriod = 0;
    let sum = 0;
    for (let i = 0; i < intervals.startMs.length; i++) {
      if (intervals.startMs[i] >= startMs && intervals.startMs[i] < endMs) {
        inPeriod++;
        sum += intervals.values[i];
      }
    }
    if (inPeriod === 0) throw new UsageError(`${csvPath}: meter '${s("meter")}' has no intervals between ${from} and ${to} (${timezone})`);
    io.err(
      `${csvPath}: ${read.rowsForMeter} rows for meter '${s("meter")}' (${inPeriod} in the period, ${read.rowsForMeter - inPeriod} outside it), ${read.rowsOtherMeters} rows of other meters not used; ${intervals.intervalMinutes}-minute intervals, multiplier ${multiplier}\n`,
    );
    usage ??= sum;
  }
  const req: PriceRequest = {
    periodStart: from,
    periodEnd: to,
    timezone,
    usage: usage as number,
    usageUnit: unit,
    demandKw: demandKw ?? null,
    powerFactor: pf ?? null,
    intervals,
    previousBillingDemandsKw,
  };
  const bill = priceBill(tariff, req);
  // Checked after pricing, so a request that cannot be priced at all says why first.
  const missing = missingInputs(tariff, from, to, { demand: demandKw !== undefined, pf: pf !== undefined, intervals: intervals !== null });
  if (missing.length > 0 && !values.estimate) {
    throw new UsageError(`${tariffPath}: this tariff needs ${missing.join("; ")}\nGive it, or pass --estimate to price without it (no demand prices 0 kW; no power factor, no adjustment).`);
  }
  if (missing.length > 0) io.err(`ohmbook price: estimating without ${missing.join("; ")}\n`);
  io.out(values.json ? `${JSON.stringify(bill, null, 2)}\n` : formatBillTable(tariff, req, bill));
  return 0;
}
