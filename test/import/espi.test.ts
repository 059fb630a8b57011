/**
 * ESPI import (outputs.md "Import of ESPI files (v2)").
 *
 * Sample files: ../shared/fixtures/espi (outside-authored, see its README), read in place. Their
 * expected totals come from scripts/reference/espi_totals.py (Python's xml.etree and decimal,
 * independent of the project's reader), committed as espi-totals.json. Code meanings (ServiceKind
 * 0/1/2, uom 72 Wh / 169 therm / 128 US gal / 42 m³, powerOfTenMultiplier, QualityOfReading) follow
 * the ESPI schema's enumerations as listed in src/import/espi/codes.ts.
 */
import { describe, expect, it } from "vitest";
import { existsSync } from "node:fs";
import { mkdtemp, readFile, readdir, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { runCli, type CliIo } from "../../src/cli/main.ts";
import { writeStarterPortfolio } from "../../src/cli/init.ts";
import { decimalToScaled } from "../../src/import/espi/decimal.ts";
import { importEspi } from "../../src/import/espi/importEspi.ts";
import { buildPortfolioSite } from "../../src/pipeline/build.ts";
import { writeEspi, type SyntheticReading } from "./espiWriter.ts";

const SAMPLES = resolve("../shared/fixtures/espi");
const haveSamples = existsSync(SAMPLES);
if (!haveSamples) console.warn(`ESPI sample tests skipped: ${SAMPLES} is absent (the shared fixtures sit beside the repository)`);
const PLACES = 24;

function recorder(): CliIo & { stdout: string; stderr: string } {
  const io = { stdout: "", stderr: "", isTty: false } as CliIo & { stdout: string; stderr: string };
  io.out = (s) => void (io.stdout += s);
  io.err = (s) => void (io.stderr += s);
  return io;
}

async function starter(): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), "ohmbook-espi-"));
  await writeStarterPortfolio(dir);
  return dir;
}

/** Every interval row the portfolio holds for meters whose id starts with `prefix`. */
async function intervalRows(dir: string, prefix: string): Promise<{ meter: string; timestamp: string; value: string; minutes: string }[]> {
  const folder = join(dir, "intervals");
  if (!existsSync(folder)) return [];
  const rows = [];
  // The starter portfolio has interval files of its own; only the imported meters' files are read.
  for (const name of (await readdir(folder)).sort().filter((n) => n.startsWith(prefix))) {
    const lines = (await readFile(join(folder, name), "utf8")).trim().split("\n");
    expect(lines[0]).toBe("meter_id,timestamp,value,interval_minutes");
    for (const line of lines.slice(1)) {
      const [meter, timestamp, value, minutes] = line.split(",") as [string, string, string, string];
      if (meter.startsWith(prefix)) rows.push({ meter, timestamp, value, minutes });
    }
  }
  return rows;
}

const sum = (values: string[]): bigint => values.reduce((a, v) => a + decimalToScaled(v, PLACES), 0n);

async function csvRows(path: string): Promise<Record<string, string>[]> {
  const [head, ...lines] = (await readFile(path, "utf8")).trim().split("\n");
  const cols = head!.split(",");
  return lines.map((l) => Object.fromEntries(l.split(",").map((v, i) => [cols[i], v])));
}

async function snapshot(dir: string): Promise<Record<string, string>> {
  const out: Record<string, string> = {};
  const walk = async (rel: string): Promise<void> => {
    for (const e of await readdir(join(dir, rel), { withFileTypes: true })) {
      const r = join(rel, e.name);
      if (e.isDirectory()) await walk(r);
      else out[r] = await readFile(join(dir, r), "utf8");
    }
  };
  await walk("");
  return out;
}

describe.skipIf(!haveSamples)("ESPI samples against the independent Python totals", async () => {
  const expected = JSON.parse(await readFile("test/import/espi-totals.json", "utf8")) as {
    files: Record<string, { zone: string; commodity: string; unit: string; interval: { count: number; total: string }; long: { count: number; total: string }; skipped: { count: number; total: string }; bills: { period_start: string; period_end: string; usage: string; total: string }[] }>;
  };
  for (const [file, want] of Object.entries(expected.files)) {
    it(`${file}: interval and bill totals match exactly; a second import adds nothing`, async () => {
      const dir = await starter();
      try {
        const io = recorder();
        const code = await runCli(["import", "espi", join(SAMPLES, file), "--into", dir, "--building", "GB", "--timezone", want.zone, "--tariff", "starter-electric", "--json"], io);
        expect(io.stderr).toBe("");
        expect(code).toBe(0);
        const report = JSON.parse(io.stdout);
        const meters = (await csvRows(join(dir, "meters.csv"))).filter((m) => m.building_id === "GB");
        expect(meters).toHaveLength(1);
        expect(meters[0]).toMatchObject({ commodity: want.commodity, unit: want.unit });
        expect(meters[0]!.meter_id).toMatch(new RegExp(`^GB-${want.commodity[0]!.toUpperCase()}-[0-9a-f]{8}$`));
        // Intervals read back from the written files.
        const rows = await intervalRows(dir, "GB-");
        expect(rows).toHaveLength(want.interval.count);
        expect(sum(rows.map((r) => r.value))).toBe(decimalToScaled(want.interval.total, PLACES));
        // Readings longer than an hour: reported, not written.
        const m = report.files[0].meters[0];
        expect(m.longReadings).toBe(want.long.count);
        expect(decimalToScaled(m.longTotal, PLACES)).toBe(decimalToScaled(want.long.total, PLACES));
        // Readings left out with a warning (no duration; a start stated twice).
        expect(m.skippedReadings).toBe(want.skipped.count);
        expect(decimalToScaled(m.skippedTotal, PLACES)).toBe(decimalToScaled(want.skipped.total, PLACES));
        expect(m.intervalReadings).toBe(want.interval.count);
        // Bills.
        const bills = (await csvRows(join(dir, "bills.csv"))).filter((b) => b.meter_id === meters[0]!.meter_id);
        expect(bills.map((b) => ({ period_start: b.period_start, period_end: b.period_end, usage: b.usage, total: b.total }))).toEqual(want.bills);

        const before = await snapshot(dir);
        const again = recorder();
        expect(await runCli(["import", "espi", join(SAMPLES, file), "--into", dir, "--building", "GB"], again)).toBe(0);
        expect(again.stdout).toMatch(/Nothing new/);
        expect(await snapshot(dir)).toEqual(before);
      } finally {
        await rm(dir, { recursive: true, force: true });
      }
    });
  }

  it("an imported sample builds (buildPortfolioSite)", async () => {
    const dir = await starter();
    const out = `${dir}-site`;
    try {
      await importEspi({
        files: [join(SAMPLES, "1hrLP_32Days.xml")], intoDir: dir, buildingId: "GB", timezone: "America/New_York",
        tariff: "starter-electric", floorArea: "1800", weatherStation: "STARTER-WX", buildingName: "Green Button home",
      });
      const result = await buildPortfolioSite({ dir, outDir: out, strict: true, buildDate: "2026-01-01" });
      expect(result.issues.filter((i) => i.severity === "error")).toEqual([]);
      expect(existsSync(join(out, "buildings", "GB.html"))).toBe(true);
      expect(await readFile(join(out, "buildings", "GB.html"), "utf8")).toContain("Green Button home");
    } finally {
      await rm(dir, { recursive: true, force: true });
      await rm(out, { recursive: true, force: true });
    }
  });
});

describe("ESPI round trips (synthetic feeds written by the test)", () => {
  // 2025-03-09 is the spring-forward day in America/New_York: 02:00 local does not exist, so
  // hourly UTC starts from 05:00Z run 00:00, 01:00, 03:00 … local (offset -05:00 then -04:00).
  const T0 = Date.UTC(2025, 2, 9, 5) / 1000;
  const hourly = (n: number, valueOf: (i: number) => string, extra: Partial<SyntheticReading> = {}): SyntheticReading[] =>
    Array.from({ length: n }, (_, i) => ({ start: T0 + i * 3600, duration: 3600, value: valueOf(i), ...extra }));

  async function importText(dir: string, name: string, xml: string, extra: string[] = []): Promise<{ code: number; io: ReturnType<typeof recorder>; file: string }> {
    const file = join(dir, "..", `${dir.split("/").pop()}-${name}`);
    await writeFile(file, xml);
    const io = recorder();
    const code = await runCli(["import", "espi", file, "--into", dir, "--building", "RT", "--timezone", "America/New_York", "--tariff", "starter-electric", "--floor-area", "100", "--weather-station", "STARTER-WX", ...extra], io);
    return { code, io, file };
  }

  it("writes values × 10^powerOfTen in kWh at ISO timestamps with the building's offset, quirks and all", async () => {
    const dir = await starter();
    // Wh × 10^-1 → kWh: 12345 → 1.2345 kWh. Quirks: spaces in values, comments, espi: prefixes.
    const xml = writeEspi({ quirks: true, powerOfTen: -1, intervalLength: 3600, blocks: [{ start: T0, duration: 4 * 3600, readings: hourly(4, (i) => String(12345 + i), { quality: 8 }) }],
      summaries: [{ start: T0, duration: 4 * 3600 + 20 * 3600 - 3600, bill: "1234567", usage: "49386", usagePow: -1, quality: 9, lines: [{ note: "Delivery", amount: "250000" }] }] });
    const { code, io } = await importText(dir, "a.xml", xml);
    expect(io.stderr).toBe("");
    expect(code).toBe(0);
    const rows = await intervalRows(dir, "RT-");
    expect(rows.map((r) => [r.timestamp, r.value, r.minutes])).toEqual([
      ["2025-03-09T00:00:00-05:00", "1.2345", "60"],
      ["2025-03-09T01:00:00-05:00", "1.2346", "60"],
      ["2025-03-09T03:00:00-04:00", "1.2347", "60"],
      ["2025-03-09T04:00:00-04:00", "1.2348", "60"],
    ]);
    // The bill: 1234567 / 100,000 = 12.34567 (kept exactly); estimated (quality 9); its cost detail as a bill line.
    const bills = (await csvRows(join(dir, "bills.csv"))).filter((b) => b.meter_id.startsWith("RT-"));
    expect(bills).toEqual([expect.objectContaining({ period_start: "2025-03-09", period_end: "2025-03-10", usage: "4.9386", total: "12.34567", read_type: "estimated" })]);
    // The starter's own bill lines come first; the import appends the feed's one line.
    const billLines = (await readFile(join(dir, "bill_lines.csv"), "utf8")).trim().split("\n");
    expect(billLines[0]).toBe("bill_id,label,amount");
    expect(billLines.filter((l) => l.startsWith(`${bills[0]!.meter_id}:`))).toEqual([`${bills[0]!.meter_id}:2025-03-09,Delivery,2.50`]);
    // Reading quality 8 kept beside the interval data.
    const quality = await readdir(join(dir, "espi", "reading-quality"));
    expect(quality).toHaveLength(1);
    expect(await readFile(join(dir, "espi", "reading-quality", quality[0]!), "utf8")).toContain("2025-03-09T00:00:00-05:00,8,estimated using reference day");
    // The portfolio still checks clean of errors.
    const check = recorder();
    await runCli(["check", dir], check);
    expect(check.stdout).not.toMatch(/: error:/);
  });

  it("an overlapping later download adds only the new intervals; the meter id stays the same", async () => {
    const dir = await starter();
    const first = writeEspi({ blocks: [{ start: T0, duration: 6 * 3600, readings: hourly(6, (i) => String(1000 + i)) }] });
    const second = writeEspi({ blocks: [{ start: T0 + 4 * 3600, duration: 4 * 3600, readings: hourly(4, (i) => String(1004 + i)).map((r, i) => ({ ...r, start: T0 + (4 + i) * 3600 })) }] });
    expect((await importText(dir, "1.xml", first)).code).toBe(0);
    const { code, io } = await importText(dir, "2.xml", second);
    expect(code).toBe(0);
    expect(io.stdout).toMatch(/2 interval row\(s\) added, 2 already there/);
    const rows = await intervalRows(dir, "RT-");
    expect(rows.map((r) => r.value)).toEqual(["1", "1.001", "1.002", "1.003", "1.004", "1.005", "1.006", "1.007"]);
    expect(new Set(rows.map((r) => r.meter)).size).toBe(1);
    expect((await csvRows(join(dir, "meters.csv"))).filter((m) => m.building_id === "RT")).toHaveLength(1);
  });

  it("readings without a timePeriod follow the block start and the ReadingType's intervalLength", async () => {
    const dir = await starter();
    const xml = writeEspi({ intervalLength: 900, blocks: [{ start: T0, duration: 3600, readings: ["1", "2", "3", "4"].map((value) => ({ start: 0, value })) }] });
    expect((await importText(dir, "p.xml", xml)).code).toBe(0);
    const rows = await intervalRows(dir, "RT-");
    expect(rows.map((r) => [r.timestamp, r.minutes])).toEqual([
      ["2025-03-09T00:00:00-05:00", "15"], ["2025-03-09T00:15:00-05:00", "15"], ["2025-03-09T00:30:00-05:00", "15"], ["2025-03-09T00:45:00-05:00", "15"],
    ]);
  });

  it("merges through a small buffer the same as through a large one (bounded-memory path)", async () => {
    const readings = hourly(500, (i) => String((i * 7919) % 1000));
    const xml = writeEspi({ blocks: [{ start: T0, duration: 500 * 3600, readings }] });
    const a = await starter();
    const b = await starter();
    const fa = join(a, "..", `${a.split("/").pop()}.xml`);
    await writeFile(fa, xml);
    await importEspi({ files: [fa], intoDir: a, buildingId: "RT", timezone: "America/New_York", flushRows: 7 });
    await importEspi({ files: [fa], intoDir: b, buildingId: "RT", timezone: "America/New_York" });
    const ra = await intervalRows(a, "RT-");
    expect(ra).toHaveLength(500);
    expect(ra).toEqual(await intervalRows(b, "RT-"));
    expect(sum(ra.map((r) => r.value))).toBe(sum(readings.map((r) => String(Number(r.value) / 1000))));
  });

  const bad: [string, Parameters<typeof writeEspi>[0], RegExp][] = [
    ["a power reading (uom 38, W)", { uom: 38, blocks: [{ start: T0, duration: 3600, readings: hourly(1, () => "5") }] }, /uom 38 \(W \(power\)\) is not a unit of energy or volume/],
    ["a service kind without a meter kind (3, time)", { kind: 3, blocks: [] }, /service kind 3 \(time\) has no ohmbook meter kind/],
    ["a decimal reading value", { blocks: [{ start: T0, duration: 3600, readings: hourly(1, () => "12.5") }] }, /IntervalReading value '12.5' is not a whole number/],
    ["a 10-minute interval", { blocks: [{ start: T0, duration: 600, readings: [{ start: T0, duration: 600, value: "1" }] }] }, /a reading of 600 s is not an interval length/],
    ["local time parameters of another zone", { tzOffset: -28800, blocks: [] }, /standard time is UTC−08:00, but building RT's zone America\/New_York has standard time UTC−05:00/],
    ["gas readings in Wh", { kind: 1, uom: 72, blocks: [{ start: T0, duration: 3600, readings: hourly(1, () => "5") }] }, /unit kWh does not measure gas/],
    ["register readings (accumulationBehaviour 3)", { accumulation: 3, blocks: [] }, /accumulationBehaviour/],
  ];
  for (const [what, feed, message] of bad) {
    it(`refuses ${what} with file:line, exit 1, and writes nothing`, async () => {
      const dir = await starter();
      const before = await snapshot(dir);
      const { code, io, file } = await importText(dir, "bad.xml", writeEspi(feed));
      expect(code).toBe(1);
      expect(io.stderr).toMatch(message);
      expect(io.stderr).toMatch(new RegExp(`${file.replace(/[.*+?^${}()|[\]\\/]/g, "\\$&")}:[1-9]\\d*:\\d+: error: `));
      expect(io.stderr).toMatch(/hint: /);
      expect(await snapshot(dir)).toEqual(before);
    });
  }

  it("--tariff goes only on meters of the tariff's commodity (starter-electric is electricity)", async () => {
    const dir = await starter();
    // Gas (kind 1) in therms (uom 169) × 10^-3: 12345 → 12.345 therm.
    const { code, io } = await importText(dir, "gas.xml", writeEspi({ kind: 1, uom: 169, powerOfTen: -3, blocks: [{ start: T0, duration: 3600, readings: hourly(1, () => "12345") }] }));
    expect(code).toBe(0);
    expect(io.stderr).toMatch(/is gas but tariff starter-electric is for electricity; its tariff column was left empty/);
    const meter = (await csvRows(join(dir, "meters.csv"))).find((m) => m.building_id === "RT");
    expect(meter).toMatchObject({ commodity: "gas", unit: "therm", tariff: "" });
    expect((await intervalRows(dir, "RT-")).map((r) => r.value)).toEqual(["12.345"]);
  });

  it("a revised reading on re-import is a conflict, not a silent overwrite", async () => {
    const dir = await starter();
    expect((await importText(dir, "1.xml", writeEspi({ blocks: [{ start: T0, duration: 3600, readings: hourly(1, () => "1000") }] }))).code).toBe(0);
    const before = await snapshot(dir);
    const { code, io } = await importText(dir, "2.xml", writeEspi({ blocks: [{ start: T0, duration: 3600, readings: hourly(1, () => "2000") }] }));
    expect(code).toBe(1);
    expect(io.stderr).toMatch(/already holds 1, this file says 2/);
    expect(await snapshot(dir)).toEqual(before);
  });

  it("malformed XML is an error with the line where it breaks", async () => {
    const dir = await starter();
    const { code, io, file } = await importText(dir, "broken.xml", `<?xml version="1.0"?>\n<feed>\n<entry>\n<id>x</ide>\n</entry></feed>\n`);
    expect(code).toBe(1);
    expect(io.stderr).toContain(`${file}:4:`);
    expect(io.stderr).toMatch(/not well-formed XML/);
  });

  it("a new building needs --timezone; the folder must be a portfolio", async () => {
    const dir = await starter();
    const file = join(dir, "..", `${dir.split("/").pop()}-tz.xml`);
    await writeFile(file, writeEspi({ blocks: [] }));
    const io = recorder();
    expect(await runCli(["import", "espi", file, "--into", dir, "--building", "NEW"], io)).toBe(1);
    expect(io.stderr).toMatch(/give --timezone ZONE/);
    const io2 = recorder();
    expect(await runCli(["import", "espi", file, "--into", tmpdir(), "--building", "NEW", "--timezone", "UTC"], io2)).toBe(1);
    expect(io2.stderr).toMatch(/not a portfolio folder/);
  });
});
