// Writes test/fixtures/spec-portfolio/ (fictional data). Run: node test/acceptance/generateSpecPortfolio.mjs
// Bill totals come from a tiny pricing of the tariff TEXT written here from tariff-format.md alone,
// not from src/. The hand-computed bills checked by specPortfolio.test.ts are worked out in that test.
import { mkdirSync, writeFileSync } from "node:fs";
import { join, dirname } from "node:path";
import { fileURLToPath } from "node:url";

const root = join(dirname(fileURLToPath(import.meta.url)), "..", "fixtures", "spec-portfolio");
for (const d of ["", "tariffs", "weather", "intervals"]) mkdirSync(join(root, d), { recursive: true });
const put = (p, s) => writeFileSync(join(root, p), s);
const r2 = (x) => Math.round((x + 1e-9) * 100) / 100;

// Month starts 2024-01-01 .. 2025-02-01 → 13 monthly bills per meter.
const starts = [];
for (let i = 0; i <= 13; i++) {
  const y = 2024 + Math.floor(i / 12), m = (i % 12) + 1;
  starts.push(`${y}-${String(m).padStart(2, "0")}-01`);
}
const days = (a, b) => (Date.parse(b) - Date.parse(a)) / 86400000;

// --- fennel-small-gs (N1-E, billed in MWh) ---
function priceSmall(kwh, from, to) {
  const v2 = from >= "2024-07-01";
  const s = days(from, to) / 30, b1 = 1000 * s, b2 = 3000 * s;
  const delivery = r2(Math.min(kwh, b1) * 0.07 + Math.max(0, Math.min(kwh, b2) - b1) * 0.055 + Math.max(0, kwh - b2) * 0.04);
  const cust = 18, fuel = r2(kwh * (v2 ? 0.015 : 0.012));
  const sub = cust + delivery + fuel;
  const minAdj = sub < 60 ? r2(60 - sub) : 0;
  const fee = r2(0.04 * (cust + delivery));
  const trans = v2 ? r2(kwh * 0.004) : 0;
  return r2(sub + minAdj + fee + trans);
}
// --- fennel-gas (therm rates, heat_content 1.05 therm/ccf) ---
const M3_PER_CCF = 2.8316846592; // 100 ft3 = 2.8316846592 m3 (exact, from 1 ft = 0.3048 m)
function priceGas(therm) {
  const sub = 12 + r2(therm * 0.45) + r2(therm * 0.62);
  return r2(sub + r2(sub * 0.05));
}
// --- fennel-water ($ per ccf; 1 ccf = 748.052 gal) ---
const priceWater = (gal) => r2(9 + r2((gal / 748.052) * 6.2));
// --- fennel-tou (S2-E): bills without interval data; peak demand assumed 85 % of billed demand ---
function priceTou(kwh, kw, peakKw) {
  const sub = 30 + r2(kwh * 0.08) + r2(kw * 5) + r2(peakKw * 9.25);
  return r2(sub + r2(sub * 0.065));
}

const bills = [["meter_id", "bill_id", "period_start", "period_end", "usage", "read_type", "demand", "total", "statement_date"]];
const lines = [["bill_id", "label", "amount"]];
const add = (meter, id, i, usage, total, extra = {}) =>
  bills.push([meter, id ?? "", starts[i], starts[i + 1], String(usage), extra.read ?? "", extra.demand ?? "", total.toFixed(2), extra.stmt ?? ""]);

// N1-E: MWh. Index 1 = Feb 2024 (29 days, minimum bill), index 9 = Oct 2024 (31 days, version 2).
const n1e = [4.8, 0.35, 4.6, 4.4, 4.9, 5.6, 6.1, 6.0, 5.3, 5.2, 4.7, 4.9, 5.0];
n1e.forEach((mwh, i) => {
  const id = i === 9 ? "LRK-2024-10" : i === 5 ? "LRK-2024-06" : undefined;
  add("N1-E", id, i, mwh, priceSmall(mwh * 1000, starts[i], starts[i + 1]), { read: i === 2 ? "estimated" : "", stmt: i === 9 ? "2024-11-05" : "" });
});
lines.push(["LRK-2024-10", "customer charge", "18.00"], ["LRK-2024-10", "DELIVERY", "270.00"],
  ["LRK-2024-10", "Fuel  adjustment", "78.00"], ["LRK-2024-10", " Franchise Fee ", "11.52"], ["LRK-2024-10", "TRANSMISSION rider", "20.80"]);

// N1-G: m3; S2-G: ccf. Heating-shaped usage.
const heat = [1.0, 0.9, 0.7, 0.45, 0.25, 0.12, 0.1, 0.1, 0.18, 0.4, 0.7, 0.95, 1.05];
heat.forEach((h, i) => {
  const m3 = Math.round(2400 * h + 60);
  add("N1-G", undefined, i, m3, priceGas((m3 / M3_PER_CCF) * 1.05), { read: i === 10 ? "estimated" : "" });
});
heat.forEach((h, i) => {
  const ccf = i === 11 ? 800 : Math.round(760 * h + 25);
  add("S2-G", undefined, i, ccf, priceGas(ccf * 1.05));
});
// E3-W: gallons; index 4 = May 2024 = 37,402.6 gal = 50 ccf exactly.
const water = [41000, 39500, 40200, 38800, 37402.6, 45100, 52300, 51800, 44800, 40100, 39000, 40500, 41200];
water.forEach((g, i) => add("E3-W", i === 0 ? "FR-W-0001" : undefined, i, g, priceWater(g), { read: i === 7 ? "estimated" : "" }));

// S2-E: kWh, interval data for January 2025 only (index 12).
const s2e = [14800, 13900, 14300, 14100, 15200, 16800, 17900, 17600, 15600, 14700, 14400, 14900];
s2e.forEach((k, i) => {
  const kw = Math.round(k / days(starts[i], starts[i + 1]) / 24 * 2.2);
  add("S2-E", undefined, i, k, priceTou(k, kw, Math.round(kw * 0.85)), { demand: String(kw) });
});
add("S2-E", "BRK-E-2025-01", 12, 15100, 2388.8, { demand: "90", stmt: "2025-02-06" });
lines.push(["BRK-E-2025-01", "Customer  Charge", "30.00"], ["BRK-E-2025-01", "energy", "1208.00"],
  ["BRK-E-2025-01", "FACILITY DEMAND", "450.00"], ["BRK-E-2025-01", "peak demand", "555.00"], ["BRK-E-2025-01", "Sales Tax", "145.80"]);

const csv = (rows) => rows.map((r) => r.map((c) => (/[",\n]|^\s|\s$/.test(c) ? `"${c.replace(/"/g, '""')}"` : c)).join(",")).join("\n") + "\n";
put("bills.csv", csv(bills));
put("bill_lines.csv", csv(lines));

// Interval data: S2-E, 60-minute, timestamps mark the interval END (portfolio.yaml), local America/Denver.
const spikes = { "2025-01-01T17:00": 90, "2025-01-07T14:00": 80, "2025-01-08T17:00": 60, "2025-01-11T17:00": 70 };
const iv = [["meter_id", "timestamp", "value", "interval_minutes"]];
for (let h = 1; h <= 744; h++) {
  const t = new Date(Date.UTC(2025, 0, 1, h)).toISOString().slice(0, 16);
  iv.push(["S2-E", t, String(spikes[t] ?? 20), "60"]);
}
put("intervals/S2-E-2025-01.csv", csv(iv));

// Weather. WX-DAILY: daily °F. WX-HOURLY: hourly °C without offsets for January 2025, daily °C for the rest.
const seasonal = (d) => Math.cos(((d.getTime() - Date.UTC(2024, 0, 20)) / 86400000 / 365.25) * 2 * Math.PI);
const wd = [["station_id", "date", "tmax_f", "tmin_f"]], wcd = [["station_id", "date", "tmax_c", "tmin_c"]];
for (let t = Date.UTC(2023, 11, 1); t < Date.UTC(2025, 2, 1); t += 86400000) {
  const d = new Date(t), jig = ((d.getUTCDate() * 7) % 5) - 2;
  const mean = 55 - 25 * seasonal(d) + jig;
  wd.push(["WX-DAILY", d.toISOString().slice(0, 10), (mean + 9).toFixed(1), (mean - 9).toFixed(1)]);
  const c = 10 - 12 * seasonal(d) + jig / 2;
  wcd.push(["WX-HOURLY", d.toISOString().slice(0, 10), (c + 7).toFixed(1), (c - 7).toFixed(1)]);
}
const wh = [["station_id", "timestamp", "temperature_c"]];
for (let h = 0; h < 744; h++) {
  const d = new Date(Date.UTC(2025, 0, 1, h));
  const c = -2 + 6 * Math.sin(((d.getUTCHours() - 9) / 24) * 2 * Math.PI) + ((d.getUTCDate() * 3) % 4);
  wh.push(["WX-HOURLY", d.toISOString().slice(0, 16), c.toFixed(1)]);
}
put("weather/WX-DAILY.csv", csv(wd));
put("weather/WX-HOURLY-daily.csv", csv(wcd));
put("weather/WX-HOURLY-hourly.csv", csv(wh));
