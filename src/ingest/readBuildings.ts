/** buildings.csv → Building[] (strict; see inputs contract). */
import { quoteValue } from "../core/issues.ts";
import type { Building } from "../domain/types.ts";
import type { FileContext } from "./fileContext.ts";
import { readCsvTable, type TableResult } from "./csvTable.ts";
import { MAX_FLOOR_AREA, idLengthProblem, limitText } from "./limits.ts";
import { isValidZone } from "../core/time/index.ts";
import { M2_PER_FT2 } from "../core/units.ts";

const ID_RE = /^[A-Za-z0-9_-]+$/;

const BUILDINGS_SPEC = {
  required: ["building_id", "name", "floor_area", "timezone", "weather_station"],
  optional: ["area_unit", "use_type", "tenant_page"],
} as const;

/** Reads buildings.csv; `name` is kept exactly as written (escaping is the site's job). */
export async function readBuildings(path: string, ctx: FileContext): Promise<{ buildings: Building[]; table: TableResult }> {
  const buildings: Building[] = [];
  const seen = new Map<string, number>();
  const seenFolded = new Map<string, [string, number]>();
  const table = await readCsvTable(path, ctx, BUILDINGS_SPEC, (row) => {
    const id = row.text("building_id", true);
    const tooLong = id === null ? null : idLengthProblem("building_id", id);
    if (tooLong) row.problem("building_id", tooLong, "the id names the building's page files; use a short code such as HQ-01");
    else if (id !== null && !ID_RE.test(id)) {
      row.problem("building_id", `building_id ${quoteValue(id)} may only use letters, digits, "_" and "-"`, "e.g. HQ-01");
    } else if (id !== null && seen.has(id)) {
      row.problem("building_id", `building_id ${id} repeats line ${seen.get(id)}`, "building_id must be unique");
    } else if (id !== null && seenFolded.has(id.toLowerCase())) {
      // Page files are named by id; Windows and macOS file systems ignore case, so the second
      // building's page would overwrite the first.
      const [other, line] = seenFolded.get(id.toLowerCase())!;
      row.problem("building_id", `building_id ${id} differs only in letter case from ${other} (line ${line})`, "page file names would collide on Windows and macOS; make the ids differ by more than case");
    }
    const name = row.raw("name");
    if (name === null) row.problem("name", "name is empty", "give the building a display name");
    const floorArea = row.number("floor_area", true, (v) => (v <= 0 ? "must be greater than 0" : v > MAX_FLOOR_AREA ? `is above ${limitText(MAX_FLOOR_AREA)}` : null));
    const areaUnit = row.choice("area_unit", ["ft2", "m2"] as const, "ft2");
    const timezone = row.text("timezone", true);
    if (timezone !== null && !isValidZone(timezone)) {
      row.problem("timezone", `timezone ${quoteValue(timezone)} is not an IANA time zone`, "e.g. America/Chicago, Europe/Berlin");
    }
    const station = row.text("weather_station", true);
    const stationTooLong = station === null ? null : idLengthProblem("weather_station", station);
    if (stationTooLong) row.problem("weather_station", stationTooLong, "use the station's short code, e.g. KORD");
    const tenant = row.text("tenant_page", false);
    let tenantPage = false;
    if (tenant !== null) {
      const t = tenant.toLowerCase();
      if (t === "yes" || t === "true") tenantPage = true;
      else if (t !== "no" && t !== "false") row.problem("tenant_page", `tenant_page ${quoteValue(tenant)} must be yes or no`, "write yes, no, or leave empty");
    }
    if (row.failed || id === null || name === null || floorArea === null || areaUnit === null || timezone === null || station === null) return;
    seen.set(id, row.line);
    seenFolded.set(id.toLowerCase(), [id, row.line]);
    buildings.push({
      buildingId: id, name, floorArea, areaUnit,
      floorAreaM2: areaUnit === "m2" ? floorArea : floorArea * M2_PER_FT2,
      timezone, weatherStation: station,
      useType: row.raw("use_type"), tenantPage,
      source: { file: ctx.file, line: row.line },
    });
  });
  return { buildings, table };
}
