/**
 * Runs every case of the malformed-input corpus (corpus.ts) through ingest in-process, and a
 * sample through the `check` command, asserting what issue 16 asks of bad input: no uncaught
 * exception, a bounded run time, the stated outcome, messages with a real file and line (paths
 * relative to the portfolio folder, text bounded), every row accounted for (read = used +
 * rejected), and every building the mutation did not touch still loaded.
 */
import { execFileSync } from "node:child_process";
import { mkdir, mkdtemp, rm, symlink, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli, type CliIo } from "../../src/cli/main.ts";
import { loadPortfolio } from "../../src/ingest/index.ts";
import { generateCases, type Case } from "./corpus.ts";

const cases = generateCases();
let scratch = "";
let outside = "";

beforeAll(async () => {
  scratch = await mkdtemp(join(tmpdir(), "ohmbook-corpus-"));
  outside = await mkdtemp(join(tmpdir(), "ohmbook-corpus-outside-"));
  await writeFile(join(outside, "outside.csv"), "meter_id,timestamp,value\nE-100,2024-03-01T00:00,1\n");
  await writeFile(join(outside, "outside.yaml"), "id: outside\n");
});
afterAll(async () => {
  await rm(scratch, { recursive: true, force: true });
  await rm(outside, { recursive: true, force: true });
});

/** Writes a case's portfolio into a fresh folder and returns its path. */
async function materialise(c: Case, index: number): Promise<string> {
  const dir = join(scratch, String(index));
  await mkdir(dir, { recursive: true });
  const fifos: string[] = [];
  for (const [rel, e] of c.files) {
    const p = join(dir, rel);
    await mkdir(dirname(p), { recursive: true });
    if (e.kind === "file") await writeFile(p, e.bytes);
    else if (e.kind === "dir") await mkdir(p, { recursive: true });
    else if (e.kind === "fifo") fifos.push(p);
    else await symlink(e.outside ? join(outside, e.target) : join(dir, e.target), p);
  }
  if (fifos.length > 0) execFileSync("mkfifo", fifos);
  return dir;
}

/** Per-case time limit: the base loads in well under a second; a hang or blow-up fails here. */

describe("malformed-input corpus", () => {
  it("has at least 200 cases across every input file, with unique names", () => {
    expect(cases.length).toBeGreaterThanOrEqual(200);
    expect(new Set(cases.map((c) => c.name)).size).toBe(cases.length);
    const touched = new Set(cases.map((c) => (c.expect.outcome === "valid" ? "" : c.expect.file.split("/")[0])));
    for (const f of ["portfolio.yaml", "buildings.csv", "meters.csv", "bills.csv", "bill_lines.csv", "intervals", "weather", "tariffs"]) expect(touched, f).toContain(f);
  });

  it.each(cases.map((c, i) => [i, c.name, c] as const))("case %i: %s", async (i, _name, c) => {
    const dir = await materialise(c, i);
    const r = await loadPortfolio(dir);

    const errors = r.issues.filter((x) => x.severity === "error");
    const where = (x: { file: string; line: number; message: string }) => `${x.file}:${x.line} ${x.message.slice(0, 160)}`;
    // Every message names a real place: a path inside the folder (never absolute), a line, bounded text.
    for (const x of r.issues) {
      expect(x.file, where(x)).not.toBe("");
      expect(x.file.startsWith("/") || x.file.includes(dir), where(x)).toBe(false);
      expect(Number.isInteger(x.line) && x.line >= 0, where(x)).toBe(true);
      expect(x.message.length, where(x)).toBeLessThanOrEqual(1000);
    }
    if (c.expect.outcome === "valid") expect(errors.map(where)).toEqual([]);
    else if (c.expect.outcome === "warning") {
      const { file, line } = c.expect;
      expect(errors.map(where)).toEqual([]);
      expect(r.issues.some((x) => x.severity === "warning" && x.file === file && (line === undefined || x.line === line)), r.issues.map(where).join("\n")).toBe(true);
    } else {
      const { file, line } = c.expect;
      expect(errors.some((x) => x.file === file && x.line === line), `expected an error at ${file}:${line}; got\n${r.issues.map(where).join("\n")}`).toBe(true);
    }
    if (c.expect.outcome === "error" && c.expect.fatal) expect(r.fatal).toBe(true);
    else {
      expect(r.fatal, r.issues.map(where).join("\n")).toBe(false);
      expect(r.portfolio!.buildings.length).toBe(c.buildings);
    }
    for (const f of r.report.files) expect(f.rowsUsed + f.rowsRejected, f.file).toBe(f.rowsRead);
    if (c.rejected) expect(r.report.files.find((f) => f.file === c.rejected!.file)?.rowsRejected).toBe(c.rejected.rows);
    expect(JSON.stringify(r.report).length).toBeLessThan(200_000);

    // A sample also goes through the `check` command in-process: exit code and printed places.
    if (i % 8 === 0) {
      let out = "";
      let err = "";
      const io: CliIo = { out: (s) => void (out += s), err: (s) => void (err += s), isTty: false };
      const code = await runCli(["check", "--quiet", dir], io);
      expect(err).not.toMatch(/internal error|at .*\.ts:\d+/);
      if (c.expect.outcome === "error") {
        expect(code).toBe(1);
        expect(out).toContain(`${dir}/${c.expect.file}:${c.expect.line}:`);
      } else expect(code, out).toBe(0);
    }
  }, 30_000);
});
