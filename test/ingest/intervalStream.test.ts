import { describe, expect, it } from "vitest";
import { parseText, wallLabels } from "./helpers.ts";

const HOUR = 3600000;

describe("parseIntervalStream — DST (America/New_York, 15 U.S.C. 260a: 2024-03-10 and 2024-11-03 at 02:00)", () => {
  it("spring-forward day: 96 wall labels → 92 intervals, the 02:xx labels rejected with a hint", async () => {
    const text = ["meter_id,timestamp,value", ...wallLabels("2024-03-10").map((t) => `M1,${t},1`)].join("\n");
    const { rows, result } = await parseText(text);
    // references.md (15 U.S.C. 260a): the March day has 92 fifteen-minute intervals.
    expect(rows.length).toBe(92);
    expect(result.report.rowsRead).toBe(96);
    expect(result.report.rowsRejected).toBe(4);
    const bad = result.issues.find((i) => i.message.includes("2024-03-10T02:30"));
    expect(bad).toMatchObject({ severity: "error", file: "data/x/intervals/a.csv", line: 12, column: 2 });
    expect(bad?.hint).toBeTruthy();
    // 00:00 EST = 05:00Z; 23:45 EDT = 03:45Z next day (hand-computed from the offsets −5 h / −4 h).
    expect(rows[0].instantMs).toBe(Date.UTC(2024, 2, 10, 5, 0));
    expect(rows[91].instantMs).toBe(Date.UTC(2024, 2, 11, 3, 45));
    // 01:45 EST → 06:45Z, then 03:00 EDT → 07:00Z: consecutive instants.
    const i0145 = rows.findIndex((r) => r.line === 9);
    expect(rows[i0145 + 1].instantMs - rows[i0145].instantMs).toBe(15 * 60000);
  });

  it("fall-back day: 01:00–01:45 written twice are two distinct hours → 100 intervals", async () => {
    const labels = wallLabels("2024-11-03");
    const repeated = ["2024-11-03T01:00", "2024-11-03T01:15", "2024-11-03T01:30", "2024-11-03T01:45"];
    const idx = labels.indexOf("2024-11-03T02:00");
    const all = [...labels.slice(0, idx), ...repeated, ...labels.slice(idx)];
    const text = ["meter_id,timestamp,value", ...all.map((t) => `M1,${t},1`)].join("\n");
    const { rows, result } = await parseText(text);
    // references.md: the November day has 100 fifteen-minute intervals.
    expect(rows.length).toBe(100);
    expect(result.report.rowsRejected).toBe(0);
    const instants = rows.map((r) => r.instantMs);
    expect(new Set(instants).size).toBe(100);
    for (let k = 1; k < instants.length; k++) expect(instants[k] - instants[k - 1]).toBe(15 * 60000);
    // First 01:00 is EDT (05:00Z), the second EST (06:00Z) — hand-computed.
    expect(instants[4]).toBe(Date.UTC(2024, 10, 3, 5, 0));
    expect(instants[8]).toBe(Date.UTC(2024, 10, 3, 6, 0));
    expect(instants[99] - instants[0]).toBe(25 * HOUR - 15 * 60000);
  });

  it("a wall time repeated in a row within the repeated hour is the later instant", async () => {
    const text = "meter_id,timestamp,value\nM1,2024-11-03T01:30,1\nM1,2024-11-03T01:30,2\n";
    const { rows } = await parseText(text);
    expect(rows.map((r) => r.instantMs)).toEqual([Date.UTC(2024, 10, 3, 5, 30), Date.UTC(2024, 10, 3, 6, 30)]);
  });

  it("timestamps with an offset are exact, whatever the zone", async () => {
    const text = "meter_id,timestamp,value\nM1,2024-03-10T02:30:00-05:00,1\nM1,2024-03-10T07:45Z,2\nM1,2024-03-10T03:00+0100,3\n";
    const { rows, result } = await parseText(text);
    expect(result.report.rowsRejected).toBe(0);
    expect(rows.map((r) => r.instantMs)).toEqual([Date.UTC(2024, 2, 10, 7, 30), Date.UTC(2024, 2, 10, 7, 45), Date.UTC(2024, 2, 10, 2, 0)]);
  });
});

describe("parseIntervalStream — layout and strict validation", () => {
  it("reads columns in any order and case, with a BOM, CRLF and interval_minutes", async () => {
    const text = "\uFEFFValue,Interval_Minutes,TIMESTAMP,Meter_Id\r\n1.5,15,2024-01-01T00:00Z,M1\r\n2.25,,2024-01-01T00:15Z,M1\r\n";
    const { rows, result } = await parseText(text);
    expect(result.issues).toEqual([]);
    expect(rows).toEqual([
      { meterId: "M1", instantMs: Date.UTC(2024, 0, 1), value: 1.5, line: 2, minutes: 15 },
      { meterId: "M1", instantMs: Date.UTC(2024, 0, 1, 0, 15), value: 2.25, line: 3, minutes: Number.NaN },
    ]);
  });

  it("rejects each bad row at file:line:column with a hint and keeps the rest", async () => {
    const text = [
      "meter_id,timestamp,value",
      "M1,2024-01-01T00:00,1", // ok (line 2)
      "M1,2024-01-01T00:15,\"1,234\"", // thousands separator (line 3)
      "M1,2024-01-01T00:30,12abc", // text in a number (line 4)
      "M1,2024-02-30T00:45,1", // not a real day (line 5)
      "M1,01/01/2024 01:00,1", // not ISO (line 6)
      "M1,2024-01-01T01:15,$12", // currency (line 7)
      "M1,2024-01-01T01:30,NaN", // NaN (line 8)
      "M1,2024-01-01T01:45,", // empty value (line 9)
      "M1,2024-01-01T02:00,1,extra", // field count (line 10)
      "M1,2024-01-01T02:15,-0.5", // negative: kept here (line 11)
    ].join("\n");
    const { rows, result } = await parseText(text);
    expect(rows.map((r) => r.line)).toEqual([2, 11]);
    expect(rows[1].value).toBe(-0.5);
    expect(result.report).toMatchObject({ rowsRead: 10, rowsUsed: 2, rowsRejected: 8 });
    const at = (line: number) => result.issues.find((i) => i.line === line);
    expect(at(3)).toMatchObject({ column: 3, severity: "error" });
    expect(at(3)?.message).toMatch(/thousands separator/);
    expect(at(4)?.message).toMatch(/not a number/);
    expect(at(5)).toMatchObject({ column: 2 });
    expect(at(6)?.message).toMatch(/not an ISO 8601/);
    expect(at(7)?.message).toMatch(/currency/);
    expect(at(8)?.message).toMatch(/finite|not a number/);
    expect(at(9)?.message).toMatch(/empty/);
    expect(at(10)?.message).toMatch(/4 fields/);
    for (const i of result.issues) expect(i.hint).toBeTruthy();
  });

  it("rejects rows of a meter not in meters.csv, with one issue per meter", async () => {
    const text = "meter_id,timestamp,value\nX9,2024-01-01T00:00Z,1\nX9,2024-01-01T00:15Z,1\nM1,2024-01-01T00:00Z,1\n";
    const { rows, result } = await parseText(text, (id) => (id === "M1" ? "UTC" : null));
    expect(rows.length).toBe(1);
    expect(result.report).toMatchObject({ rowsRead: 3, rowsUsed: 1, rowsRejected: 2 });
    const unknown = result.issues.filter((i) => i.message.includes("X9"));
    expect(unknown).toHaveLength(1);
    expect(unknown[0]).toMatchObject({ line: 2, column: 1, severity: "error" });
  });

  it("warns once about unknown columns", async () => {
    const text = "meter_id,timestamp,value,quality,note\nM1,2024-01-01T00:00Z,1,A,x\nM1,2024-01-01T00:15Z,1,A,y\n";
    const { rows, result } = await parseText(text);
    expect(rows.length).toBe(2);
    const warnings = result.issues.filter((i) => i.severity === "warning");
    expect(warnings).toHaveLength(1);
    expect(warnings[0].message).toMatch(/quality, note/);
  });

  it("a missing required column skips the file with one error", async () => {
    const { rows, result } = await parseText("meter_id,time,value\nM1,2024-01-01T00:00Z,1\n");
    expect(rows).toEqual([]);
    expect(result.skipped).toBe(true);
    expect(result.issues[0].message).toMatch(/no timestamp column/);
  });

  it("handles quoted fields, including a quoted meter id with a comma", async () => {
    const text = 'meter_id,timestamp,value\n"M,1","2024-01-01T00:00Z","2.5"\n"M,1",2024-01-01T00:15Z,3\nM1,"2024-01-01T00:00Z,1\n';
    const { rows, result } = await parseText(text, () => "UTC");
    expect(rows.map((r) => [r.meterId, r.value])).toEqual([["M,1", 2.5], ["M,1", 3]]);
    expect(result.issues).toHaveLength(1);
    expect(result.issues[0]).toMatchObject({ line: 4 });
  });

  it("gives the same rows whatever the chunk size (lines split across chunks)", async () => {
    const text = ["meter_id,timestamp,value", ...wallLabels("2024-11-03").map((t, k) => `M${k % 3},${t},${k}.5`)].join("\n");
    const whole = await parseText(text, () => "America/Chicago");
    for (const size of [1, 7, 64]) {
      const split = await parseText(text, () => "America/Chicago", size);
      expect(split.rows).toEqual(whole.rows);
    }
  });

  it("reads numbers exactly as Number() does on valid text", async () => {
    // 15 significant digits (fast path) and 19 (slow path), within the 1e9 reading limit.
    const values = ["0.1", "123456.789", "-0.000001", "999999.999999999", "1e3", "123456789.0123456789", ".5", "7."];
    const text = ["meter_id,timestamp,value", ...values.map((v, k) => `M1,2024-01-01T00:${String(k).padStart(2, "0")}Z,${v}`)].join("\n");
    const { rows } = await parseText(text);
    expect(rows.map((r) => r.value)).toEqual(values.map(Number));
  });

  it("rejects readings beyond ±1e9 and timestamps outside 1900–2199 (src/ingest/limits.ts)", async () => {
    const text = ["meter_id,timestamp,value", "M1,2024-01-01T00:00Z,1000000001", "M1,2024-01-01T00:15Z,1e308", "M1,0001-01-01T00:00Z,1", "M1,2024-01-01T00:30Z,-1e9"].join("\n");
    const { rows, result } = await parseText(text);
    expect(rows.map((r) => r.value)).toEqual([-1e9]);
    expect(result.issues.map((i) => [i.line, i.column])).toEqual([[2, 3], [3, 3], [4, 2]]);
    expect(result.report).toMatchObject({ rowsRead: 4, rowsUsed: 1, rowsRejected: 3 });
  });
});

describe("parseIntervalStream — every line ending, at every chunk boundary (issue 16)", () => {
  it.each([["LF", "\n"], ["CRLF", "\r\n"], ["CR", "\r"]])("%s", async (_name, eol) => {
    const lines = ["meter_id,timestamp,value", "M1,2024-01-01T00:00Z,1", "M1,2024-01-01T00:15Z,2", "", "M1,2024-01-01T00:30Z,3"];
    for (const chunk of [1, 2, 3, 5, 64]) {
      const { rows, result } = await parseText(lines.join(eol) + eol, () => "UTC", chunk);
      expect(rows.map((r) => [r.line, r.value]), `chunk ${chunk}`).toEqual([[2, 1], [3, 2], [5, 3]]);
      expect(result.issues).toEqual([]);
    }
  });
  it("a meter id followed by a no-break space or zero-width space is the same meter", async () => {
    const { rows, result } = await parseText("meter_id,timestamp,value\nM1\u00A0,2024-01-01T00:00Z,1\n\u200BM1,2024-01-01T00:15Z,2\n\u00A0,2024-01-01T00:30Z,3\n", () => "UTC");
    expect(rows.map((r) => r.meterId)).toEqual(["M1", "M1"]);
    expect(result.issues.map((i) => [i.line, i.message])).toEqual([[4, "meter_id is empty"]]);
  });
});
