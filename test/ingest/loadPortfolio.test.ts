import { cp, mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { formatIssue } from "../../src/core/issues.ts";
import { loadPortfolio } from "../../src/ingest/index.ts";

const GOOD = "test/fixtures/ingest/good";
const BAD = "test/fixtures/ingest/bad";

describe("loadPortfolio on a folder written only from inputs.md", () => {
  it("loads with zero errors, every row used, every file reported", async () => {
    const seen: string[] = [];
    const r = await loadPortfolio(GOOD, { onFile: (f) => seen.push(f) });
    expect(r.issues.filter((i) => i.severity === "error").map(formatIssue)).toEqual([]);
    expect(r.fatal).toBe(false);
    const p = r.portfolio!;
    expect(p.settings.name).toBe("Lindenfold Estates");
    expect(p.settings.basePath).toBe("/reports/");
    expect(p.settings.escalation.electricity).toBe(0.03);
    for (const f of p.report.files) {
      expect(f.rowsRejected, f.file).toBe(0);
      expect(f.rowsUsed, f.file).toBe(f.rowsRead);
    }
    expect(p.report.files.map((f) => f.file)).toEqual(seen);
    // Paths are relative to the portfolio folder (issue 16: published files never carry the builder's folders).
    expect(seen).toContain("bills.csv");
    expect(seen).toContain("intervals/E-100-2024.csv");
    expect(seen).toContain("weather/normals/kxaa.csv");
  });

  it("keeps a building name with <script> and quotes exactly as written (HTML escaping is the site's job)", async () => {
    const p = (await loadPortfolio(GOOD)).portfolio!;
    expect(p.buildings[0].name).toBe("Mill Yard <script>alert(1)</script> & Co, Annex");
    // 25,000 ft² × 0.09290304 m²/ft² (international foot, exact) = 2322.576 m².
    expect(p.buildings[0].floorAreaM2).toBeCloseTo(2322.576, 9);
    expect(p.buildings[1].floorAreaM2).toBe(4000);
  });

  it("reads meters with columns in another case, default bill ids with #2 repeats, bill lines, tariffs by id", async () => {
    const p = (await loadPortfolio(GOOD)).portfolio!;
    expect(p.meters.map((m) => [m.meterId, m.unit, m.multiplier, m.account])).toEqual([
      ["E-100", "kWh", 1, "ACCT-0001"],
      ["G-200", "therm", 1, null],
    ]);
    expect(p.bills.map((b) => b.billId)).toEqual(["E-100:2024-03-01", "E-100:2024-04-01", "G-200:2024-03-01", "G-200:2024-03-01#2"]);
    expect(p.bills[1]).toMatchObject({ readType: "estimated", demandKw: null, powerFactor: null, statementDate: null });
    expect(p.billLines.map((l) => l.billId)).toEqual(["E-100:2024-03-01", "E-100:2024-03-01", "G-200:2024-03-01#2"]);
    expect([...p.tariffs.keys()].sort()).toEqual(["fen-gas", "fen-gs"]);
  });

  it("builds interval series and hourly weather in °C on a UTC grid", async () => {
    const r = await loadPortfolio(GOOD);
    const s = r.portfolio!.intervals.get("E-100")!;
    expect(s.intervalMinutes).toBe(15);
    // 2024-03-01 00:00 in New York is EST (UTC−5) → 05:00Z.
    expect(s.startMs[0]).toBe(Date.UTC(2024, 2, 1, 5));
    const w = r.portfolio!.weather.get("KXAA")!;
    expect(w.startMs).toBe(Date.UTC(2024, 2, 1, 5));
    expect(w.tempC[0]).toBeCloseTo(5, 12); // 41 °F = 5 °C
    expect(r.weatherGaps).toEqual([
      { stationId: "KXAA", startMs: Date.UTC(2024, 2, 1, 15), endMs: Date.UTC(2024, 2, 1, 17), hours: 2, action: "interpolated" },
    ]);
  });
});

describe("loadPortfolio on bad input", () => {
  const load = () => loadPortfolio(BAD);
  const find = async (file: string, line: number) => (await load()).issues.filter((i) => i.file === file && i.line === line);

  it("is not fatal: bad rows are rejected and counted, good rows kept", async () => {
    const r = await load();
    expect(r.fatal).toBe(false);
    const counts = Object.fromEntries(r.portfolio!.report.files.map((f) => [f.file, [f.rowsRead, f.rowsUsed, f.rowsRejected]]));
    expect(counts).toMatchObject({
      "buildings.csv": [6, 2, 4],
      "meters.csv": [6, 2, 4],
      "bills.csv": [7, 1, 6],
      "bill_lines.csv": [2, 1, 1],
      "intervals/a.csv": [6, 5, 1],
      "intervals/b.csv": [2, 1, 1],
    });
    for (const f of r.portfolio!.report.files) expect(f.rowsUsed + f.rowsRejected, f.file).toBe(f.rowsRead);
  });

  it("buildings: BOM header read, unknown column warned once, `1,234`, bad zone, duplicate id", async () => {
    const r = await load();
    const b = r.issues.filter((i) => i.file === "buildings.csv");
    expect(b.filter((i) => i.message.includes("unknown column"))).toHaveLength(1);
    expect((await find("buildings.csv", 3))[0]).toMatchObject({ column: 3, severity: "error" });
    expect((await find("buildings.csv", 3))[0].message).toMatch(/thousands separator/);
    expect((await find("buildings.csv", 4))[0].message).toMatch(/IANA/);
    expect((await find("buildings.csv", 5))[0].message).toMatch(/repeats line 2/);
    expect(r.portfolio!.buildings[0].name).toBe('<script>alert("x")</script> Hall');
    const station = b.find((i) => i.message.includes("KNONE"));
    expect(station).toMatchObject({ severity: "warning", line: 7 });
  });

  it("meters: unknown building, unit/commodity mismatch, unknown tariff, text in a number", async () => {
    expect((await find("meters.csv", 3))[0]).toMatchObject({ column: 2 });
    expect((await find("meters.csv", 4))[0]).toMatchObject({ column: 4 });
    expect((await find("meters.csv", 5))[0]).toMatchObject({ column: 5 });
    expect((await find("meters.csv", 6))[0]).toMatchObject({ column: 6 });
    const p = (await load()).portfolio!;
    expect(p.meters.find((m) => m.meterId === "E1")?.unit).toBe("kWh"); // "kwh" → canonical spelling
  });

  it("bills: unknown meter, bad date, empty period, pf > 1, currency symbol, meter rejected upstream", async () => {
    expect((await find("bills.csv", 3))[0].message).toMatch(/E9.*not in meters.csv/);
    expect((await find("bills.csv", 4))[0]).toMatchObject({ column: 2 });
    expect((await find("bills.csv", 5))[0]).toMatchObject({ column: 3 });
    expect((await find("bills.csv", 6))[0]).toMatchObject({ column: 5 });
    expect((await find("bills.csv", 7))[0].message).toMatch(/currency symbol/);
    expect((await find("bills.csv", 8))[0].message).toMatch(/rejected in .*meters.csv:3/);
    for (const i of (await load()).issues.filter((x) => x.severity === "error")) expect(i.hint, formatIssue(i)).toBeTruthy();
  });

  it("weather: text and implausible temperatures and a nonexistent local time are rejected; °F converted", async () => {
    const r = await load();
    const rep = r.portfolio!.report.files.find((f) => f.file.endsWith("kbbb-more.csv"))!;
    expect([rep.rowsRead, rep.rowsUsed, rep.rowsRejected]).toEqual([4, 1, 3]);
    expect((await find("weather/kbbb-more.csv", 2))[0]).toMatchObject({ column: 3 });
    expect((await find("weather/kbbb-more.csv", 3))[0].message).toMatch(/plausible/);
    expect((await find("weather/kbbb-more.csv", 4))[0].message).toMatch(/does not exist in America\/New_York/);
    const w = r.portfolio!.weather.get("KBBB")!;
    // 35.6 °F = 2 °C at 04:00Z; 02:00 and 03:00 interpolated between 2 °C (01:00) and 2 °C.
    expect(w.tempC[4]).toBeCloseTo(2, 12);
    expect(Array.from(w.filled.slice(0, 5))).toEqual([0, 0, 1, 1, 0]);
  });

  it("intervals: files merged per meter, sorted, first duplicate kept, negatives kept and warned", async () => {
    const r = await load();
    const s = r.portfolio!.intervals.get("E1")!;
    // Local 00:00–00:45 EST = 05:00–05:45Z; the 00:00 in b.csv and the second 00:15 are duplicates.
    expect(Array.from(s.startMs)).toEqual([0, 15, 30, 45].map((m) => Date.UTC(2024, 0, 1, 5, m)));
    expect(Array.from(s.values)).toEqual([1, -2, 3, 4]);
    const dup = r.issues.filter((i) => i.message.startsWith("duplicate reading"));
    expect(dup.map((i) => [i.file, i.line])).toEqual([["intervals/b.csv", 3], ["intervals/a.csv", 5]]);
    expect(r.issues.filter((i) => i.message.includes("negative"))).toHaveLength(1);
  });
});

describe("loadPortfolio fatal cases", () => {
  const dirs: string[] = [];
  afterAll(async () => {
    for (const d of dirs) await rm(d, { recursive: true, force: true });
  });
  const variant = async (change: (dir: string) => Promise<void>): Promise<string> => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-ingest-"));
    dirs.push(dir);
    await cp(GOOD, dir, { recursive: true });
    await change(dir);
    return dir;
  };

  it.each([
    ["portfolio.yaml missing", async (d: string) => rm(join(d, "portfolio.yaml")), /no portfolio.yaml/],
    ["portfolio.yaml without name", async (d: string) => writeFile(join(d, "portfolio.yaml"), "currency: USD\n"), /no name/],
    ["portfolio.yaml unparseable", async (d: string) => writeFile(join(d, "portfolio.yaml"), "name: [x\n"), /YAML syntax/],
    ["buildings.csv missing", async (d: string) => rm(join(d, "buildings.csv")), /buildings.csv is missing/],
    ["meters.csv missing", async (d: string) => rm(join(d, "meters.csv")), /meters.csv is missing/],
    ["bills.csv missing", async (d: string) => rm(join(d, "bills.csv")), /bills.csv is missing/],
    [
      "bills.csv without the total column",
      async (d: string) => {
        const text = await readFile(join(d, "bills.csv"), "utf8");
        await writeFile(join(d, "bills.csv"), text.replace(",total,", ",amount,"));
      },
      /missing required column\(s\): total/,
    ],
  ])("%s → fatal, portfolio null, clear error", async (_name, change, message) => {
    const r = await loadPortfolio(await variant(change));
    expect(r.fatal).toBe(true);
    expect(r.portfolio).toBeNull();
    expect(r.issues.some((i) => i.severity === "error" && message.test(i.message))).toBe(true);
  });
});

describe("loadPortfolio key uniqueness", () => {
  const dirs: string[] = [];
  afterAll(async () => {
    for (const d of dirs) await rm(d, { recursive: true, force: true });
  });
  const copy = async (): Promise<string> => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-ingest-"));
    dirs.push(dir);
    await cp(GOOD, dir, { recursive: true });
    return dir;
  };

  it("an explicit bill_id used twice rejects the second row", async () => {
    const dir = await copy();
    await writeFile(join(dir, "bills.csv"), "bill_id,meter_id,period_start,period_end,usage,total\nB1,E-100,2024-01-01,2024-02-01,10,5\nB1,E-100,2024-02-01,2024-03-01,10,5\n");
    await writeFile(join(dir, "bill_lines.csv"), "bill_id,label,amount\nB1,Energy,5\n");
    const r = await loadPortfolio(dir);
    expect(r.portfolio!.bills.map((b) => b.billId)).toEqual(["B1"]);
    const e = r.issues.filter((i) => i.severity === "error");
    expect(e).toHaveLength(1);
    expect(e[0]).toMatchObject({ line: 3, column: 1 });
  });

  it("two tariff files with the same id: the second is rejected", async () => {
    const dir = await copy();
    await cp(join(dir, "tariffs", "fen-gs.yaml"), join(dir, "tariffs", "fen-gs-copy.yaml"));
    const r = await loadPortfolio(dir);
    const e = r.issues.filter((i) => i.severity === "error");
    expect(e).toHaveLength(1);
    expect(e[0].file).toBe("tariffs/fen-gs.yaml");
    expect(e[0].message).toMatch(/already used by .*fen-gs-copy.yaml/);
    expect(r.portfolio!.tariffs.size).toBe(2);
  });
});

describe("loadPortfolio weather rules", () => {
  const dirs: string[] = [];
  afterAll(async () => {
    for (const d of dirs) await rm(d, { recursive: true, force: true });
  });

  it("reads offset-less weather in the buildings' zone, warns when they disagree, converts daily °F", async () => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-ingest-"));
    dirs.push(dir);
    await cp(GOOD, dir, { recursive: true });
    await writeFile(join(dir, "buildings.csv"),
      "building_id,name,floor_area,timezone,weather_station\nA,Alpha,100,America/New_York,KQQ\nB,Beta,100,America/Chicago,KQQ\nLF-01,Gamma,100,America/New_York,KXAA\nLF-02,Delta,100,America/New_York,KXAA\n");
    await writeFile(join(dir, "weather", "kqq.csv"), "station_id,timestamp,temperature_c\nKQQ,2024-01-10T00:00,4\nKQQ,2024-01-10T01:00,6\n");
    await writeFile(join(dir, "weather", "kqq-daily.csv"), "station_id,date,tmax_f,tmin_f\nKQQ,2024-01-11,50,32\n");
    const r = await loadPortfolio(dir);
    expect(r.issues.filter((i) => i.severity === "error").map(formatIssue)).toEqual([]);
    expect(r.issues.filter((i) => /different time zones/.test(i.message))).toHaveLength(1);
    const w = r.portfolio!.weather.get("KQQ")!;
    // Read in the first building's zone (New York, UTC−5 in January): 00:00 local = 05:00Z.
    expect(w.startMs).toBe(Date.UTC(2024, 0, 10, 5));
    expect(Array.from(w.tempC.slice(0, 2))).toEqual([4, 6]);
    // Daily 50/32 °F = 10/0 °C; 15:00 local on the 11th (20:00Z) is the maximum.
    const k = (Date.UTC(2024, 0, 11, 20) - w.startMs) / 3600000;
    expect(w.tempC[k]).toBeCloseTo(10, 9);
  });
});


describe("loadPortfolio contacts (tenant page contact lines)", () => {
  const dirs: string[] = [];
  afterAll(async () => {
    for (const d of dirs) await rm(d, { recursive: true, force: true });
  });

  it("keeps the contact of a building with a tenant page; warns at the key on an unknown id or a building without one", async () => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-ingest-"));
    dirs.push(dir);
    await cp(GOOD, dir, { recursive: true });
    const yaml = await readFile(join(dir, "portfolio.yaml"), "utf8");
    // LF-01 has tenant_page yes, LF-02 no (test/fixtures/ingest/good/buildings.csv); LF-99 does not exist.
    await writeFile(join(dir, "portfolio.yaml"), `${yaml}contacts:\n  LF-01: Front desk, 555-0101\n  LF-02: Caretaker\n  LF-99: Nobody\n`);
    const r = await loadPortfolio(dir);
    const contactsLine = yaml.trimEnd().split("\n").length + 1; // the "contacts:" line; LF-02 is 2 below it
    expect(r.portfolio!.settings.contacts).toEqual({ "LF-01": "Front desk, 555-0101", "LF-02": "Caretaker", "LF-99": "Nobody" });
    const warnings = r.issues.filter((i) => i.file === "portfolio.yaml").map(formatIssue);
    expect(warnings).toEqual([
      `portfolio.yaml:${contactsLine + 2}:3: warning: contact for LF-02 is not shown: the building has no tenant page (hint: set tenant_page to yes for it in buildings.csv, or remove the contact)`,
      `portfolio.yaml:${contactsLine + 3}:3: warning: contacts names building "LF-99", which is not in buildings.csv (hint: use a building_id from buildings.csv)`,
    ]);
  });
});

describe("meter units come from the tariff engine's list", () => {
  it("a water meter may bill in kgal, and unit aliases read as the tariff loader reads them", async () => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-units-"));
    try {
      await cp(GOOD, dir, { recursive: true });
      await writeFile(join(dir, "tariffs", "fen-water.yaml"), "id: fen-water\ncommodity: water\nusage_unit: kgal\nversions:\n  - from: 2020-01-01\n    charges:\n      - { label: Water, energy: 6.10 }\n");
      const meters = await readFile(join(dir, "meters.csv"), "utf8");
      await writeFile(join(dir, "meters.csv"), `${meters.replace("G-200,LF-02,gas,therm", "G-200,LF-02,gas,Therms")}W-300,LF-01,water,KGAL,fen-water,,\n`);
      const r = await loadPortfolio(dir);
      expect(r.issues.filter((i) => i.severity === "error")).toEqual([]);
      expect(r.portfolio!.meters.map((m) => [m.meterId, m.unit])).toEqual([["E-100", "kWh"], ["G-200", "therm"], ["W-300", "kgal"]]);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
