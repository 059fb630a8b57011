/**
 * Runs analyseBuilding over the first N buildings of a portfolio folder in this one thread,
 * for profiling (`node --cpu-prof --import tsx bench/profileAnalysis.ts DIR [N]`), and prints
 * the CPU seconds the analyses took and a digest of their results (to compare before/after).
 */
import { createHash } from "node:crypto";
import { loadPortfolio } from "../src/ingest/index.ts";
import { assessIntervalMeters } from "../src/clean/index.ts";
import { cutAtAsOf } from "../src/pipeline/asOf.ts";
import { analyseBuilding } from "../src/pipeline/analyseBuilding.ts";
import type { Portfolio } from "../src/domain/types.ts";
import type { Tariff } from "../src/tariff/index.ts";

const dir = process.argv[2] ?? "data/demo";
const n = Number(process.argv[3] ?? 8);
const skip = Number(process.argv[4] ?? 0);
const loaded = await loadPortfolio(dir);
if (!loaded.portfolio) throw new Error("portfolio did not load");
const quality = assessIntervalMeters(cutAtAsOf(loaded.portfolio).portfolio);
const portfolio = quality.portfolio as Portfolio<Tariff>;
const masks = new Map(quality.meters.map((q) => [q.meterId, q.mask]));
const hash = createHash("sha256");
const t0 = process.cpuUsage();
for (const building of portfolio.buildings.slice(skip, skip + n)) {
  const r = analyseBuilding(portfolio, building, masks);
  const u = process.cpuUsage(t0);
  hash.update(JSON.stringify({ f: r.findings, b: r.baselines, i: r.intervalBaselines, fail: r.failure }, (k, v) => (k === "fitMs" || k === "cvMs" ? undefined : v instanceof Map ? [...v] : ArrayBuffer.isView(v) ? Array.from(v as unknown as ArrayLike<number>) : v)));
  console.log(building.buildingId, ((u.user + u.system) / 1e6).toFixed(2));
}
const u = process.cpuUsage(t0);
console.log(`cpu ${((u.user + u.system) / 1e6).toFixed(2)} s for ${Math.min(n, portfolio.buildings.length - skip)} buildings; digest ${hash.digest("hex").slice(0, 16)}`);
