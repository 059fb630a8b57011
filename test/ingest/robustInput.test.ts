/**
 * Regression tests for issue 16, items 2, 4 and 6: no silent loss (a stray quote costs one row,
 * every line ending reads, ids trimmed by one rule), only regular files inside the portfolio
 * folder read, no crash on huge numbers of rejections, bounded messages.
 * Expected outcomes come from the input contract (/work/shared/spec/inputs.md: "every rejected
 * or ignored row is reported with file:line and a reason … nothing is lost silently") and
 * RFC 4180 for quoting.
 */
import { execFileSync } from "node:child_process";
import { cp, mkdir, mkdtemp, readFile, rm, symlink, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Readable } from "node:stream";
import { afterEach, describe, expect, it } from "vitest";
import { csvRecords, physicalLines, MAX_RECORD_LINES } from "../../src/ingest/csvRecords.ts";
import { loadPortfolio } from "../../src/ingest/index.ts";
import { trimId } from "../../src/core/trimId.ts";
import { DETAILS_PER_REASON } from "../../src/ingest/fileContext.ts";

const GOOD = "test/fixtures/ingest/good";
const dirs: string[] = [];
afterEach(async () => {
  for (const d of dirs.splice(0)) await rm(d, { recursive: true, force: true });
});
async function copyGood(): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), "ohmbook-robust-"));
  dirs.push(dir);
  await cp(GOOD, dir, { recursive: true });
  return dir;
}
async function records(text: string, width = Infinity, chunk = 7) {
  const parts: string[] = [];
  for (let i = 0; i < text.length; i += chunk) parts.push(text.slice(i, i + chunk));
  const out = [];
  for await (const r of csvRecords(physicalLines(Readable.from(parts.map((p) => Buffer.from(p)))), () => width)) out.push(r);
  return out;
}
const accounted = (files: { rowsRead: number; rowsUsed: number; rowsRejected: number; file: string }[]) => {
  for (const f of files) expect(f.rowsUsed + f.rowsRejected, f.file).toBe(f.rowsRead);
};

describe("physicalLines: every line ending convention", () => {
  // LF (Unix), CRLF (Windows, RFC 4180) and lone CR (classic Mac) each end exactly one line.
  it.each([["LF", "\n"], ["CRLF", "\r\n"], ["CR", "\r"]])("%s", async (_name, eol) => {
    for (const chunk of [1, 2, 3, 64]) {
      const recs = await records(["a,b", "1,2", "3,4", ""].join(eol), Infinity, chunk);
      expect(recs.map((r) => [r.line, r.fields])).toEqual([[1, ["a", "b"]], [2, ["1", "2"]], [3, ["3", "4"]]]);
    }
  });
});

describe("csvRecords: a stray quote costs only its row", () => {
  it("reports the line and field where the quote opens, then reads every following line", async () => {
    const recs = await records('h1,h2,h3\nA,1,2\nB,"oops,3\nC,4,5\nD,6,7\n', 3);
    expect(recs.map((r) => r.line)).toEqual([1, 2, 3, 4, 5]);
    expect(recs[2].fields).toBeNull();
    expect(recs[2].error?.column).toBe(2);
    expect(recs.slice(3).map((r) => r.fields)).toEqual([["C", "4", "5"], ["D", "6", "7"]]);
  });
  it("a later stray quote does not glue the lines in between into one cell", async () => {
    // Without the look-back the quote on line 2 would close on line 4, swallowing line 3.
    const recs = await records('h1,h2\n"A,1\nB,2\nC,"x\nD,3\n', 2);
    expect(recs.map((r) => [r.line, r.fields])).toEqual([[1, ["h1", "h2"]], [2, null], [3, ["B", "2"]], [4, null], [5, ["D", "3"]]]);
  });
  it("a real multi-line quoted cell (RFC 4180 §2.6) is one record at its first line", async () => {
    const recs = await records('id,note\nA,"two\nlines"\nB,x\n', 2);
    expect(recs.map((r) => [r.line, r.fields])).toEqual([[1, ["id", "note"]], [2, ["A", "two\nlines"]], [4, ["B", "x"]]]);
  });
  it("a quote left open over more than MAX_RECORD_LINES lines is treated as stray", async () => {
    const body = Array.from({ length: MAX_RECORD_LINES + 5 }, (_, i) => `r${i},1`).join("\n");
    const recs = await records(`a,b\nX,"open\n${body}\nY,"z"\n`, 2);
    expect(recs[1]).toMatchObject({ line: 2, fields: null });
    expect(recs.filter((r) => r.fields !== null).length).toBe(MAX_RECORD_LINES + 5 + 2);
  });
  it("doubled quotes and a quote inside an unquoted cell are text", async () => {
    const recs = await records('a,b\n"say ""hi""",He said "no"\n');
    expect(recs[1].fields).toEqual(['say "hi"', 'He said "no"']);
  });
});

describe("trimId: one whitespace rule for every id", () => {
  it("removes Unicode spaces, BOM and zero-width characters at both ends only", () => {
    // Characters: ECMAScript WhiteSpace (NBSP U+00A0, BOM U+FEFF, U+2007, U+3000) plus ZWSP U+200B.
    expect(trimId("\uFEFF M1\u00A0\u2007\u200B\u3000\t")).toBe("M1");
    expect(trimId("A\u00A0B")).toBe("A\u00A0B");
  });
});

describe("loadPortfolio: no silent loss", () => {
  it("a stray quote in bills.csv rejects that bill only; every other bill of every building is read", async () => {
    const dir = await copyGood();
    const before = (await loadPortfolio(GOOD)).portfolio!.bills.length;
    const lines = (await readFile(join(dir, "bills.csv"), "utf8")).split("\n");
    lines[2] = lines[2].replace(",2024-04-01,", ',"2024-04-01,');
    await writeFile(join(dir, "bills.csv"), lines.join("\n"));
    const r = await loadPortfolio(dir);
    expect(r.portfolio!.bills.length).toBe(before - 1);
    const e = r.issues.filter((i) => i.file === "bills.csv" && i.severity === "error");
    expect(e).toHaveLength(1);
    expect(e[0]).toMatchObject({ line: 3, column: 2 });
    const rep = r.report.files.find((f) => f.file === "bills.csv")!;
    expect(rep.rowsRejected).toBe(1);
    accounted(r.report.files);
  });

  it.each([["CR", "\r"], ["CRLF", "\r\n"]])("%s line endings read in every CSV, interval files included", async (_n, eol) => {
    const dir = await copyGood();
    const ref = await loadPortfolio(GOOD);
    for (const f of ["bills.csv", "meters.csv", "buildings.csv", "intervals/E-100-2024.csv", "weather/kxaa-hourly.csv"]) {
      const t = await readFile(join(dir, f), "utf8");
      await writeFile(join(dir, f), t.replace(/\r?\n/g, eol));
    }
    const r = await loadPortfolio(dir);
    expect(r.issues.filter((i) => i.severity === "error")).toEqual([]);
    const rows = (x: typeof r) => x.report.files.map((f) => [f.file, f.rowsRead, f.rowsUsed]);
    expect(rows(r)).toEqual(rows(ref));
  });

  it("a no-break space after a meter id is the same id in meters, bills and intervals", async () => {
    const dir = await copyGood();
    const ref = await loadPortfolio(GOOD);
    for (const f of ["bills.csv", "intervals/E-100-2024.csv"]) {
      const t = await readFile(join(dir, f), "utf8");
      await writeFile(join(dir, f), t.replace(/^E-100,/gm, "E-100\u00A0,"));
    }
    const r = await loadPortfolio(dir);
    expect(r.issues.filter((i) => i.severity === "error")).toEqual([]);
    expect(r.portfolio!.intervals.get("E-100")?.values.length).toBe(ref.portfolio!.intervals.get("E-100")?.values.length);
    expect(r.portfolio!.bills.length).toBe(ref.portfolio!.bills.length);
  });
});

describe("loadPortfolio: only regular files inside the portfolio folder", () => {
  it("a folder where bills.csv belongs is a fatal file:0:0 error, not a crash", async () => {
    const dir = await copyGood();
    await rm(join(dir, "bills.csv"));
    await mkdir(join(dir, "bills.csv"));
    const r = await loadPortfolio(dir);
    expect(r.fatal).toBe(true);
    expect(r.issues).toContainEqual(expect.objectContaining({ file: "bills.csv", line: 0, column: 0, severity: "error", message: "this is a folder, not a file" }));
  });

  it("a FIFO named bill_lines.csv or placed in intervals/ is refused without blocking", async () => {
    const dir = await copyGood();
    await rm(join(dir, "bill_lines.csv"));
    execFileSync("mkfifo", [join(dir, "bill_lines.csv"), join(dir, "intervals", "pipe.csv")]);
    const r = await loadPortfolio(dir);
    for (const f of ["bill_lines.csv", "intervals/pipe.csv"]) {
      expect(r.issues).toContainEqual(expect.objectContaining({ file: f, line: 0, severity: "error", message: "this is a named pipe (FIFO), not a file" }));
    }
    expect(r.fatal).toBe(false);
  }, 10_000);

  it("symbolic links: inside the folder followed, outside refused with a message, dangling reported", async () => {
    const dir = await copyGood();
    const outside = await mkdtemp(join(tmpdir(), "ohmbook-outside-"));
    dirs.push(outside);
    await writeFile(join(outside, "x.csv"), "meter_id,timestamp,value\nE-100,2024-06-01T00:00,1\n");
    await mkdir(join(dir, "store"));
    await cp(join(dir, "tariffs", "fen-gas.yaml"), join(dir, "store", "fen-gas.yaml"));
    await rm(join(dir, "tariffs", "fen-gas.yaml"));
    await symlink(join(dir, "store", "fen-gas.yaml"), join(dir, "tariffs", "fen-gas.yaml"));
    await symlink(join(outside, "x.csv"), join(dir, "intervals", "outside.csv"));
    await symlink(join(dir, "nowhere.csv"), join(dir, "intervals", "dangling.csv"));
    const r = await loadPortfolio(dir);
    expect(r.portfolio!.tariffs.has("fen-gas")).toBe(true);
    expect(r.issues).toContainEqual(expect.objectContaining({ file: "intervals/outside.csv", line: 0, message: "symbolic link points outside the portfolio folder and is not followed" }));
    expect(r.issues.find((i) => i.file === "intervals/dangling.csv")?.message).toMatch(/symbolic link cannot be followed/);
  });
});

describe("loadPortfolio: bounded work and output", () => {
  it("200,000 rejected bills: no stack overflow, every row counted, messages grouped", async () => {
    // Before the fix, spreading >~125k issues into push() threw RangeError (issue 16).
    const dir = await copyGood();
    const n = 200_000;
    const rows = ["meter_id,period_start,period_end,usage,total"];
    for (let i = 0; i < n; i++) rows.push(`NOPE-${i},2024-01-01,2024-02-01,1,1`);
    await writeFile(join(dir, "bills.csv"), rows.join("\n"));
    const r = await loadPortfolio(dir);
    const rep = r.report.files.find((f) => f.file === "bills.csv")!;
    expect(rep).toMatchObject({ rowsRead: n, rowsUsed: 0, rowsRejected: n });
    const listed = r.issues.filter((i) => i.file === "bills.csv");
    expect(listed.length).toBe(DETAILS_PER_REASON + 1);
    expect(listed.at(-1)!.message).toMatch(/^199,980 more rows with the same problem from line 22 on, the first: meter_id "NOPE-20" /);
    expect(rep.rejections.length).toBe(DETAILS_PER_REASON + 1);
  }, 30_000);

  it("a 10 MB cell is never echoed whole", async () => {
    const dir = await copyGood();
    const t = await readFile(join(dir, "bills.csv"), "utf8");
    await writeFile(join(dir, "bills.csv"), `${t.trimEnd()}\nE-100,2024-09-01,2024-10-01,${"9".repeat(10_000_000)}x,actual,,,1,\n`);
    const r = await loadPortfolio(dir);
    const e = r.issues.filter((i) => i.file === "bills.csv" && i.severity === "error");
    expect(e).toHaveLength(1);
    expect(e[0].message.length).toBeLessThan(400);
    expect(e[0].message).toContain("… (10,000,001 characters)");
    expect(JSON.stringify(r.report).length).toBeLessThan(100_000);
  }, 30_000);
});
