/** meters.csv → Meter[]: commodity/unit pairs, known building and tariff, unique ids. */
import { quoteValue } from "../core/issues.ts";
import type { Meter } from "../domain/types.ts";
import { COMMODITIES } from "../domain/types.ts";
import type { FileContext } from "./fileContext.ts";
import { readCsvTable, type TableResult } from "./csvTable.ts";
import { MAX_MULTIPLIER, idLengthProblem, limitText } from "./limits.ts";
import { canonicalUnit, UNITS_BY_COMMODITY } from "../tariff/index.ts";

const METERS_SPEC = {
  required: ["meter_id", "building_id", "commodity", "unit", "tariff"],
  optional: ["multiplier", "account"],
} as const;

export interface MeterRefs {
  buildingIds: ReadonlySet<string>;
  /** Tariff ids loaded; null when tariffs could not be checked at all. */
  tariffIds: ReadonlySet<string> | null;
  /** Tariff ids whose file had errors → that file, for a clearer message. */
  failedTariffs?: ReadonlyMap<string, string>;
}

/**
 * Reads meters.csv, rejecting rows whose building or tariff does not exist.
 * `rejectedIds` maps ids of rejected rows to `file:line`, so bills can say why their meter is unknown.
 */
export async function readMeters(path: string, ctx: FileContext, refs: MeterRefs): Promise<{ meters: Meter[]; rejectedIds: Map<string, string>; table: TableResult }> {
  const meters: Meter[] = [];
  const rejectedIds = new Map<string, string>();
  const seen = new Map<string, number>();
  const seenFolded = new Map<string, [string, number]>();
  const table = await readCsvTable(path, ctx, METERS_SPEC, (row) => {
    const id = row.text("meter_id", true);
    const tooLong = id === null ? null : idLengthProblem("meter_id", id);
    if (tooLong) row.problem("meter_id", tooLong, "use a shorter meter id; the utility's long number can go in account");
    else if (id !== null && seen.has(id)) row.problem("meter_id", `meter_id ${id} repeats line ${seen.get(id)}`, "meter_id must be unique");
    else if (id !== null && seenFolded.has(id.toLowerCase())) {
      // Meter pages are files named by id; case-insensitive file systems would merge the two.
      const [other, line] = seenFolded.get(id.toLowerCase())!;
      row.problem("meter_id", `meter_id ${id} differs only in letter case from ${other} (line ${line})`, "page file names would collide on Windows and macOS; make the ids differ by more than case");
    }
    const buildingId = row.text("building_id", true);
    if (buildingId !== null && !refs.buildingIds.has(buildingId)) {
      row.problem("building_id", `building_id ${quoteValue(buildingId)} is not in buildings.csv`, "add the building or correct the id (ids are case-sensitive)");
    }
    const commodity = row.choice("commodity", COMMODITIES, null);
    const unitText = row.text("unit", true);
    let unit: string | null = null;
    if (commodity !== null && unitText !== null) {
      // The tariff engine's list: a meter may bill in any unit a tariff can be quoted in (water kgal too).
      const allowed = UNITS_BY_COMMODITY[commodity];
      unit = canonicalUnit(commodity, unitText);
      if (unit === null) row.problem("unit", `unit ${quoteValue(unitText)} is not a ${commodity} unit`, `for ${commodity} use ${allowed.join(", ")}`);
    }
    const tariffId = row.text("tariff", true);
    if (tariffId !== null && refs.tariffIds !== null && !refs.tariffIds.has(tariffId)) {
      const failedIn = refs.failedTariffs?.get(tariffId);
      if (failedIn) row.problem("tariff", `tariff ${tariffId} could not be loaded (${failedIn} has errors)`, "fix the tariff file first");
      else row.problem("tariff", `tariff ${quoteValue(tariffId)} matches no tariff file id`, "the value must equal the `id:` of a file in tariffs/");
    }
    const multiplier = row.number("multiplier", false, (v) => (v <= 0 ? "must be greater than 0" : v > MAX_MULTIPLIER ? `is above ${limitText(MAX_MULTIPLIER)}` : null)) ?? 1;
    if (row.failed || id === null || buildingId === null || commodity === null || unit === null || tariffId === null) {
      if (id !== null && !seen.has(id)) rejectedIds.set(id, `${ctx.file}:${row.line}`);
      return;
    }
    seen.set(id, row.line);
    seenFolded.set(id.toLowerCase(), [id, row.line]);
    meters.push({
      meterId: id, buildingId, commodity, unit, tariffId, multiplier,
      account: row.raw("account"),
      source: { file: ctx.file, line: row.line },
    });
  });
  return { meters, rejectedIds, table };
}
