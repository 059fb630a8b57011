/** bills.csv → Bill[] (half-open service periods, default bill ids) and bill_lines.csv → BillLine[]. */
import { quoteValue } from "../core/issues.ts";
import type { Bill, BillLine } from "../domain/types.ts";
import type { FileContext } from "./fileContext.ts";
import { readCsvTable, type TableResult } from "./csvTable.ts";
import { daysBetween } from "../core/time/index.ts";
import { MAX_BILL_DAYS, MAX_BILL_ID_BYTES, MAX_BILL_TOTAL, MAX_BILL_USAGE, MAX_DEMAND_KW, idLengthProblem, limitText, withinMagnitude } from "./limits.ts";

const BILLS_SPEC = {
  required: ["meter_id", "period_start", "period_end", "usage", "total"],
  optional: ["bill_id", "read_type", "demand", "power_factor", "statement_date"],
} as const;

const BILL_LINES_SPEC = { required: ["bill_id", "label", "amount"], optional: [] } as const;

/**
 * Reads bills.csv. `meterIds` are the meters accepted from meters.csv; `rejectedMeters`
 * maps meter ids rejected there to their line, for a clearer message.
 * A bill without bill_id gets `meter_id:period_start`, repeats of it `#2`, `#3`, …;
 * an explicit bill_id must be unique.
 */
export async function readBills(
  path: string,
  ctx: FileContext,
  meterIds: ReadonlySet<string>,
  rejectedMeters: ReadonlyMap<string, string>,
): Promise<{ bills: Bill[]; table: TableResult }> {
  const bills: Bill[] = [];
  const explicit = new Map<string, number>();
  const defaultCount = new Map<string, number>();
  const table = await readCsvTable(path, ctx, BILLS_SPEC, (row) => {
    const meterId = row.text("meter_id", true);
    if (meterId !== null && !meterIds.has(meterId)) {
      const where = rejectedMeters.get(meterId);
      row.problem("meter_id", where ? `meter ${meterId} was rejected in ${where}` : `meter_id ${quoteValue(meterId)} is not in meters.csv`,
        where ? "fix that meter row first" : "add the meter to meters.csv or correct the id");
    }
    const billIdGiven = row.text("bill_id", false);
    const billIdTooLong = billIdGiven === null ? null : idLengthProblem("bill_id", billIdGiven, MAX_BILL_ID_BYTES);
    if (billIdTooLong) row.problem("bill_id", billIdTooLong, "use a shorter bill id, e.g. the statement number");
    else if (billIdGiven !== null && explicit.has(billIdGiven)) {
      row.problem("bill_id", `bill_id ${billIdGiven} repeats line ${explicit.get(billIdGiven)}`, "bill_id must be unique; leave it empty to use meter_id:period_start");
    }
    const start = row.date("period_start", true);
    const end = row.date("period_end", true);
    if (start !== null && end !== null && !(start < end)) {
      row.problem("period_end", `period_end ${end} is not after period_start ${start}`, "period_end is the next read date, the first day NOT in the bill");
    } else if (start !== null && end !== null && daysBetween(start, end) > MAX_BILL_DAYS) {
      row.problem("period_end", `the period from ${start} to ${end} lasts ${daysBetween(start, end)} days, more than ${MAX_BILL_DAYS}`, "check the dates: a bill covers at most a year");
    }
    const usage = row.number("usage", true, withinMagnitude(MAX_BILL_USAGE));
    const readType = row.choice("read_type", ["actual", "estimated"] as const, "actual");
    const demand = row.number("demand", false, (v) => (v < 0 ? "must not be negative" : v > MAX_DEMAND_KW ? `is above ${limitText(MAX_DEMAND_KW)} kW` : null));
    const pf = row.number("power_factor", false, (v) => (v > 0 && v <= 1 ? null : "must be > 0 and <= 1"));
    const total = row.number("total", true, withinMagnitude(MAX_BILL_TOTAL));
    const statementDate = row.date("statement_date", false);
    if (row.failed || meterId === null || start === null || end === null || usage === null || readType === null || total === null) return;
    let billId: string;
    if (billIdGiven !== null) {
      billId = billIdGiven;
      explicit.set(billId, row.line);
    } else {
      const base = `${meterId}:${start}`;
      const n = (defaultCount.get(base) ?? 0) + 1;
      defaultCount.set(base, n);
      billId = n === 1 ? base : `${base}#${n}`;
    }
    bills.push({
      billId, meterId, periodStart: start, periodEnd: end, usage, readType,
      demandKw: demand, powerFactor: pf, total, statementDate,
      source: { file: ctx.file, line: row.line },
    });
  });
  // An explicit id equal to a generated default would make two bills share an id.
  const ids = new Map<string, number>();
  for (const b of bills) {
    const prev = ids.get(b.billId);
    if (prev !== undefined) ctx.warn(b.source.line, 0, `bill_id ${b.billId} is also used at line ${prev}`, "give the bills distinct bill_id values");
    else ids.set(b.billId, b.source.line);
  }
  return { bills, table };
}

/** Reads bill_lines.csv; `label` is kept exactly as printed. Lines of unknown bills are rejected. */
export async function readBillLines(path: string, ctx: FileContext, billIds: ReadonlySet<string>): Promise<{ lines: BillLine[]; table: TableResult }> {
  const lines: BillLine[] = [];
  const table = await readCsvTable(path, ctx, BILL_LINES_SPEC, (row) => {
    const billId = row.text("bill_id", true);
    if (billId !== null && !billIds.has(billId)) {
      row.problem("bill_id", `bill_id ${quoteValue(billId)} is not a bill in bills.csv`, "without a bill_id column in bills.csv the id is meter_id:period_start");
    }
    const label = row.raw("label");
    if (label === null) row.problem("label", "label is empty", "copy the charge name as printed");
    const amount = row.number("amount", true, withinMagnitude(MAX_BILL_TOTAL));
    if (row.failed || billId === null || label === null || amount === null) return;
    lines.push({ billId, label, amount, source: { file: ctx.file, line: row.line } });
  });
  return { lines, table };
}
