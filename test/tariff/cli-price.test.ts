/** `ohmbook price` (src/cli/price.ts) end to end on temporary files. Amounts hand-computed. */
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { runPrice } from "../../src/cli/price.ts";

const dir = mkdtempSync(join(tmpdir(), "ohmbook-price-"));
const tariffPath = join(dir, "lvp.yaml");
writeFileSync(
  tariffPath,
  `id: lvp-cli
name: Larkspur Valley Power test schedule
commodity: electricity
usage_unit: kWh
versions:
  - from: 2025-01-01
    periods:
      peak: { days: weekdays, hours: "12:00-14:00" }
      off-peak: {}
    charges:
      - { label: Customer charge, fixed: 12.75 }
      - { label: Energy, energy: 0.1125 }
      - { label: Facility demand, demand: 10.00, window_minutes: 30 }
      - { label: Peak energy adder, energy: { peak: 0.05, off-peak: 0 } }
      - { label: Tax, percent: 5 }
`,
);

async function run(...argv: string[]) {
  let out = "";
  let err = "";
  const code = await runPrice(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

describe("runPrice", () => {
  it("prints an aligned table with every line and the total (--usage)", async () => {
    const r = await run("--tariff", tariffPath, "--usage", "1250", "--from", "2025-01-01", "--to", "2025-02-01", "--demand", "40");
    expect(r.code).toBe(0);
    // Customer 12.75; Energy 1,250 × 0.1125 = 140.625 -> 140.63; Demand 40 × 10 = 400.00;
    // Peak adder without intervals: January has 23 weekdays × 2 h = 46 peak hours of 744;
    // 1,250 × 46/744 = 77.2849 kWh × 0.05 = 3.8642 -> 3.86 (marked needs interval data)
    // Tax 5 % × (12.75 + 140.63 + 400.00 + 3.86 = 557.24) = 27.862 -> 27.86; total 585.10
    expect(r.out).toMatch(/^Customer charge +1 +bill +12\.75 +12\.75$/m);
    expect(r.out).toMatch(/^Energy +1,250 +kWh +0\.1125 +140\.63$/m);
    expect(r.out).toMatch(/^Peak energy adder .* 3\.86 +\[needs interval data\]/m);
    expect(r.out).toMatch(/^Tax +557\.24 +USD +5% +27\.86/m);
    expect(r.out).toMatch(/^Total +585\.10 +not exact/m);
  });

  // Regression (issue 16): 1e308 priced to a blank total with exit 0.
  it("a figure beyond the plausibility limit is an error, never a blank or infinite total", async () => {
    const r = await run("--tariff", tariffPath, "--usage", "1e308", "--from", "2025-01-01", "--to", "2025-02-01", "--demand", "40");
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/--usage 1e308 is beyond/);
    expect(r.out).toBe("");
  });

  it("--json prints the computed bill", async () => {
    const r = await run("--tariff", tariffPath, "--usage", "1250", "--from", "2025-01-01", "--to", "2025-02-01", "--demand", "40", "--json");
    expect(r.code).toBe(0);
    const bill = JSON.parse(r.out);
    expect(bill.total).toBe(585.1);
    expect(bill.lines).toHaveLength(5);
    expect(bill.lines[1]).toMatchObject({ label: "Energy", quantity: 1250, unit: "kWh", rate: 0.1125, amount: 140.63, status: "exact" });
  });

  it("prices from an interval CSV with a multiplier", async () => {
    // 2025-01-15 (Wednesday), 15-minute rows of 0.5 kWh × multiplier 10 = 5 kWh (20 kW),
    // except 12:00 and 12:15 at 1.5 × 10 = 15 kWh. Another meter's rows are ignored.
    const rows = ["meter_id,timestamp,value"];
    for (let i = 0; i < 96; i++) {
      const t = new Date(Date.UTC(2025, 0, 15) + i * 900_000).toISOString().replace(".000Z", "Z");
      rows.push(`M1,${t},${i === 48 || i === 49 ? 1.5 : 0.5}`);
      rows.push(`M2,${t},9`);
    }
    const csv = join(dir, "intervals.csv");
    writeFileSync(csv, `${rows.join("\n")}\n`);
    const r = await run("--tariff", tariffPath, "--intervals", csv, "--meter", "M1", "--multiplier", "10", "--from", "2025-01-15", "--to", "2025-01-16", "--json");
    expect(r.code).toBe(0);
    const bill = JSON.parse(r.out);
    // usage = 94 × 5 + 2 × 15 = 500 kWh; Energy 500 × 0.1125 = 56.25
    // demand: 30-minute max = (15 + 15) kWh / 0.5 h = 60 kW × 10 = 600.00
    // peak adder: peak 12:00–14:00 = 8 intervals: 2 × 15 + 6 × 5 = 60 kWh × 0.05 = 3.00
    // tax 5 % × (12.75 + 56.25 + 600.00 + 3.00 = 672.00) = 33.60; total 705.60
    expect(bill.lines.map((l: { amount: number }) => l.amount)).toEqual([12.75, 56.25, 600, 3, 33.6]);
    expect(bill.total).toBe(705.6);
    expect(bill.exact).toBe(true);
    expect(r.err).toMatch(/96 rows for meter 'M1' \(96 in the period, 0 outside it\), 96 rows of other meters not used; 15-minute intervals/);
  });

  it("--timestamps end shifts each reading to the interval it closes", async () => {
    // Two hourly readings stamped at their end: 01:00 and 02:00 UTC -> intervals 00:00 and 01:00 of
    // 2025-01-15, both inside the one-day bill. 10 kWh each: Energy 20 × 0.1125 = 2.25;
    // demand 10 kWh / 1 h = 10 kW (window shorter than the interval: the hourly value) × 10 = 100.00
    // Tax 5 % × (12.75 + 2.25 + 100.00 + 0.00 = 115.00) = 5.75; total 120.75
    const csv = join(dir, "end.csv");
    writeFileSync(csv, "meter_id,timestamp,value\nM9,2025-01-15T01:00:00Z,10\nM9,2025-01-15T02:00:00Z,10\n");
    const r = await run("--tariff", tariffPath, "--intervals", csv, "--meter", "M9", "--timestamps", "end", "--from", "2025-01-15", "--to", "2025-01-16", "--json");
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out).total).toBe(120.75);
  });

  it("local timestamps without offset: the repeated autumn hour is read as its second pass", async () => {
    // America/New_York, 2024-11-03 (25 h): hourly rows 00:00, 01:00, 01:00 (again), 02:00 … 23:00 local,
    // 25 rows of 2 kWh. All 25 are distinct intervals: usage 50 kWh × 0.1125 = 5.625 -> 5.63 (Energy line)
    const rows = ["meter_id,timestamp,value", "M5,2024-11-03T00:00:00,2", "M5,2024-11-03T01:00:00,2", "M5,2024-11-03T01:00:00,2"];
    for (let h = 2; h < 24; h++) rows.push(`M5,2024-11-03T${String(h).padStart(2, "0")}:00:00,2`);
    const csv = join(dir, "fallback.csv");
    writeFileSync(csv, `${rows.join("\n")}\n`);
    const old = join(dir, "lvp-2024.yaml");
    writeFileSync(old, readFileSync(tariffPath, "utf8").replace("from: 2025-01-01", "from: 2024-01-01"));
    const r = await run("--tariff", old, "--intervals", csv, "--meter", "M5", "--timezone", "America/New_York", "--from", "2024-11-03", "--to", "2024-11-04", "--json");
    expect(r.code, r.err).toBe(0);
    expect(r.err).toMatch(/25 rows for meter 'M5' \(25 in the period, 0 outside it\)/);
    const bill = JSON.parse(r.out);
    expect(bill.lines[1]).toMatchObject({ label: "Energy", quantity: 50, amount: 5.63 });
    // demand: 2 kWh per hour = 2 kW (hourly data, 30-minute window -> hourly value) × 10 = 20.00
    expect(bill.lines[2]).toMatchObject({ label: "Facility demand", quantity: 2, amount: 20 });
  });

  it("a broken tariff file: file:line:column on stderr, exit 1", async () => {
    const bad = join(dir, "bad.yaml");
    writeFileSync(bad, "id: x\ncommodity: electricity\nusage_unit: kWh\nversions:\n  - from: 2025-01-01\n    charges:\n      - { label: A, fixd: 3 }\n");
    const r = await run("--tariff", bad, "--usage", "1", "--from", "2025-01-01", "--to", "2025-02-01");
    expect(r.code).toBe(1);
    expect(r.out).toBe("");
    expect(r.err).toContain(`${bad}:7:21: error: unknown key 'fixd' in a charge`);
  });

  it("bad arguments and unpriceable requests: one clear line, exit 1, no stack", async () => {
    const cases = [
      [["--tariff", tariffPath, "--usage", "1,250", "--from", "2025-01-01", "--to", "2025-02-01"], /--usage '1,250' is not a number/],
      [["--tariff", tariffPath, "--usage", "1", "--from", "2025-01-01"], /--to is required/],
      [["--tariff", tariffPath, "--usage", "1", "--from", "2024-01-01", "--to", "2024-02-01"], /no version of tariff 'lvp-cli' is in force on 2024-01-01/],
      [["--tariff", tariffPath, "--usage", "1", "--unit", "gal", "--from", "2025-01-01", "--to", "2025-02-01"], /cannot convert gal to kWh/],
      [["--tariff", join(dir, "missing.yaml"), "--usage", "1", "--from", "2025-01-01", "--to", "2025-02-01"], /cannot read tariff file .*ENOENT/],
      [["--tariff", tariffPath, "--usage", "1", "--from", "2025-01-01", "--to", "2025-02-01", "--bogus"], /Unknown option '--bogus'/],
    ] as const;
    for (const [argv, message] of cases) {
      const r = await run(...argv);
      expect(r.code, argv.join(" ")).toBe(1);
      expect(r.err).toMatch(message);
      expect(r.err).not.toMatch(/\n\s+at /);
    }
  });
});

describe("price reads interval files as build does", () => {
  const demo = join(import.meta.dirname, "..", "..", "data", "demo");
  const whs = join(demo, "intervals", "WHS-E.csv");
  const whsTariff = join(demo, "tariffs", readFileSync(join(demo, "meters.csv"), "utf8").split("\n").find((l) => l.startsWith("WHS-E,"))!.split(",")[4] + ".yaml");

  it("a timestamp without an offset and no --timezone is an error naming file:line:column, never a silent UTC", async () => {
    const r = await run("--tariff", whsTariff, "--intervals", whs, "--meter", "WHS-E", "--from", "2024-10-01", "--to", "2024-11-01");
    expect(r.code).toBe(1);
    expect(r.out).toBe("");
    expect(r.err).toContain(`${whs}:2:7: timestamp '2024-09-06T00:00:00' has no UTC offset; pass --timezone ZONE`);
  });

  it("the same instants and values as the build's reader (src/ingest), DST changes included", async () => {
    const { loadPortfolio, readMeterIntervalFile } = await import("../../src/ingest/index.ts");
    const built = (await loadPortfolio(demo)).portfolio!.intervals.get("WHS-E")!;
    const read = await readMeterIntervalFile(whs, { fileLabel: "WHS-E.csv", meterId: "WHS-E", zone: "America/Chicago", stamp: "start" }); // cedar-flats, buildings.csv
    expect(read.issues.filter((x) => x.severity === "error")).toEqual([]);
    expect(read.series!.intervalMinutes).toBe(built.intervalMinutes);
    expect(Array.from(read.series!.startMs)).toEqual(Array.from(built.startMs));
    expect(Array.from(read.series!.values)).toEqual(Array.from(built.values));
  });
});
