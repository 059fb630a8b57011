/**
 * A synthetic portfolio of N buildings with the demo's mix, for the scale benchmark: the demo's
 * 8 buildings (data/demo) replicated in order, copy r ≥ 1 of each with every id suffixed `-r<r>`
 * (building, meter, bill and interval rows), its name suffixed " (copy r)" and its floor area
 * scaled by a seeded factor in [0.8, 1.2]. Usage, demand and totals are the demo's own, so every
 * copy re-prices, reconciles and audits like its original (the planted problems are copied too)
 * and the work per building stays the demo's. Tariffs, weather and normals are shared.
 * N = 8 gives the demo itself (copy 0 keeps the original ids). Deterministic: same N, same seed →
 * the same files byte for byte.
 */
import { copyFile, mkdir, readdir, readFile, writeFile } from "node:fs/promises";
import { join } from "node:path";
import { mulberry32 } from "../../src/core/random.ts";

/** Splits one CSV line into raw fields (quotes kept), enough for the demo's own files. */
function splitCsvLine(line: string): string[] {
  const out: string[] = [];
  let field = "";
  let quoted = false;
  for (const ch of line) {
    if (ch === '"') quoted = !quoted;
    if (ch === "," && !quoted) {
      out.push(field);
      field = "";
    } else field += ch;
  }
  out.push(field);
  return out;
}

function unquote(field: string): string {
  return field.startsWith('"') ? field.slice(1, -1).replace(/""/g, '"') : field;
}

function quote(text: string): string {
  return /[",\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

interface Table {
  header: string;
  columns: string[];
  rows: string[][];
}

async function readTable(path: string): Promise<Table> {
  const lines = (await readFile(path, "utf8")).split("\n").filter((l) => l !== "");
  const header = lines[0]!;
  return { header, columns: splitCsvLine(header), rows: lines.slice(1).map(splitCsvLine) };
}

async function copyTree(from: string, to: string): Promise<void> {
  await mkdir(to, { recursive: true });
  for (const entry of await readdir(from, { withFileTypes: true })) {
    if (entry.isDirectory()) await copyTree(join(from, entry.name), join(to, entry.name));
    else await copyFile(join(from, entry.name), join(to, entry.name));
  }
}

export interface ScalePortfolio {
  buildings: number;
  meters: number;
  intervalMeters: number;
  bills: number;
}

/**
 * Writes the portfolio of `buildings` buildings into `outDir` (created; must be new or empty).
 * @example await writeScalePortfolio("data/demo", "/tmp/p", 32, 1)
 */
export async function writeScalePortfolio(demoDir: string, outDir: string, buildings: number, seed = 1): Promise<ScalePortfolio> {
  if (!Number.isInteger(buildings) || buildings < 1) throw new Error(`--buildings must be a whole number ≥ 1, got ${buildings}`);
  await mkdir(outDir, { recursive: true });
  await copyFile(join(demoDir, "portfolio.yaml"), join(outDir, "portfolio.yaml"));
  await copyTree(join(demoDir, "tariffs"), join(outDir, "tariffs"));
  await copyTree(join(demoDir, "weather"), join(outDir, "weather"));

  const demoBuildings = await readTable(join(demoDir, "buildings.csv"));
  const demoMeters = await readTable(join(demoDir, "meters.csv"));
  const demoBills = await readTable(join(demoDir, "bills.csv"));
  const demoLines = await readTable(join(demoDir, "bill_lines.csv"));
  const col = (t: Table, name: string) => {
    const i = t.columns.indexOf(name);
    if (i < 0) throw new Error(`${name} missing from the demo's ${t.header}`);
    return i;
  };
  const random = mulberry32(seed);
  const perBuilding = demoBuildings.rows.length;
  const copies: { copy: number; row: string[] }[] = [];
  for (let i = 0; i < buildings; i++) copies.push({ copy: Math.floor(i / perBuilding), row: demoBuildings.rows[i % perBuilding]! });
  const suffix = (copy: number) => (copy === 0 ? "" : `-r${copy}`);

  const bId = col(demoBuildings, "building_id");
  const bName = col(demoBuildings, "name");
  const bArea = col(demoBuildings, "floor_area");
  const buildingLines = [demoBuildings.header];
  const chosen = new Map<string, number[]>(); // original building id → copies
  for (const { copy, row } of copies) {
    const out = [...row];
    out[bId] = row[bId]! + suffix(copy);
    if (copy > 0) {
      out[bName] = quote(`${unquote(row[bName]!)} (copy ${copy})`);
      out[bArea] = String(Math.round(Number(row[bArea]) * (0.8 + 0.4 * random())));
    }
    buildingLines.push(out.join(","));
    chosen.set(row[bId]!, [...(chosen.get(row[bId]!) ?? []), copy]);
  }
  await writeFile(join(outDir, "buildings.csv"), `${buildingLines.join("\n")}\n`);

  const mId = col(demoMeters, "meter_id");
  const mBuilding = col(demoMeters, "building_id");
  const meterCopies = new Map<string, number[]>(); // original meter id → copies
  const meterLines = [demoMeters.header];
  for (const row of demoMeters.rows) {
    for (const copy of chosen.get(row[mBuilding]!) ?? []) {
      const out = [...row];
      out[mId] = row[mId]! + suffix(copy);
      out[mBuilding] = row[mBuilding]! + suffix(copy);
      meterLines.push(out.join(","));
      meterCopies.set(row[mId]!, [...(meterCopies.get(row[mId]!) ?? []), copy]);
    }
  }
  await writeFile(join(outDir, "meters.csv"), `${meterLines.join("\n")}\n`);

  const billMeter = col(demoBills, "meter_id");
  const billId = col(demoBills, "bill_id");
  const billCopies = new Map<string, number[]>();
  const billLines = [demoBills.header];
  for (const row of demoBills.rows) {
    for (const copy of meterCopies.get(row[billMeter]!) ?? []) {
      const out = [...row];
      out[billMeter] = row[billMeter]! + suffix(copy);
      out[billId] = row[billId]! + suffix(copy);
      billLines.push(out.join(","));
      billCopies.set(row[billId]!, [...(billCopies.get(row[billId]!) ?? []), copy]);
    }
  }
  await writeFile(join(outDir, "bills.csv"), `${billLines.join("\n")}\n`);

  const lineBill = col(demoLines, "bill_id");
  const lineLines = [demoLines.header];
  for (const row of demoLines.rows) {
    for (const copy of billCopies.get(row[lineBill]!) ?? []) {
      const out = [...row];
      out[lineBill] = row[lineBill]! + suffix(copy);
      lineLines.push(out.join(","));
    }
  }
  await writeFile(join(outDir, "bill_lines.csv"), `${lineLines.join("\n")}\n`);

  // Interval files: one file per original file and copy, meter ids suffixed on every row.
  await mkdir(join(outDir, "intervals"), { recursive: true });
  const intervalMeters = new Set<string>();
  for (const name of (await readdir(join(demoDir, "intervals"))).sort()) {
    const text = await readFile(join(demoDir, "intervals", name), "utf8");
    const firstRow = text.indexOf("\n") + 1;
    const meter = text.slice(firstRow, text.indexOf(",", firstRow));
    for (const copy of meterCopies.get(meter) ?? []) {
      intervalMeters.add(meter + suffix(copy));
      const target = join(outDir, "intervals", copy === 0 ? name : name.replace(/\.csv$/, `${suffix(copy)}.csv`));
      if (copy === 0) await writeFile(target, text);
      else await writeFile(target, text.replace(new RegExp(`^${meter},`, "gm"), `${meter}${suffix(copy)},`));
    }
  }
  return { buildings, meters: meterLines.length - 1, intervalMeters: intervalMeters.size, bills: billLines.length - 1 };
}
