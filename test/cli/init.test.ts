/**
 * `ohmbook init` (issue 14, item 4): one example of every input kind of the input contract
 * (shared/spec/inputs.md, its folder listing and sections), and the result checks and builds with
 * no warning at all and no audit finding. Every file is read by the build: the ingest report
 * lists each with every row used.
 */
import { describe, expect, it } from "vitest";
import { mkdtemp, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { runCli, type CliIo } from "../../src/cli/main.ts";
import { starterFiles } from "../../src/cli/init.ts";

function recorder(): CliIo & { stdout: string; stderr: string } {
  const io = { stdout: "", stderr: "", isTty: false } as CliIo & { stdout: string; stderr: string };
  io.out = (s) => void (io.stdout += s);
  io.err = (s) => void (io.stderr += s);
  return io;
}

/** The input kinds of inputs.md and how to recognise each in the starter's file list. */
const INPUT_KINDS: [string, (files: string[], text: (f: string) => string) => boolean][] = [
  ["portfolio.yaml", (f) => f.includes("portfolio.yaml")],
  ["buildings.csv", (f) => f.includes("buildings.csv")],
  ["meters.csv", (f) => f.includes("meters.csv")],
  ["bills.csv", (f) => f.includes("bills.csv")],
  ["bill_lines.csv", (f) => f.includes("bill_lines.csv")],
  ["intervals/*.csv", (f) => f.some((p) => /^intervals\/[^/]+\.csv$/.test(p))],
  ["hourly weather/*.csv", (f, t) => f.some((p) => /^weather\/[^/]+\.csv$/.test(p) && /^station_id,timestamp,temperature_[cf]\n/.test(t(p)))],
  ["daily weather/*.csv", (f, t) => f.some((p) => /^weather\/[^/]+\.csv$/.test(p) && /^station_id,date,tmax_[cf],tmin_[cf]\n/.test(t(p)))],
  ["weather/normals/*.csv", (f) => f.some((p) => /^weather\/normals\/[^/]+\.csv$/.test(p))],
  ["electricity tariff", (f, t) => f.some((p) => p.startsWith("tariffs/") && /^commodity: electricity/m.test(t(p)))],
  ["gas tariff", (f, t) => f.some((p) => p.startsWith("tariffs/") && /^commodity: gas/m.test(t(p)))],
  ["water tariff", (f, t) => f.some((p) => p.startsWith("tariffs/") && /^commodity: water/m.test(t(p)))],
];

describe("ohmbook init", () => {
  const files = starterFiles();
  const paths = Object.keys(files);
  const text = (p: string) => files[p] ?? "";

  for (const [kind, present] of INPUT_KINDS) {
    it(`writes an example of ${kind}`, () => {
      expect(present(paths, text)).toBe(true);
    });
  }

  it("comments every YAML file and explains every CSV file in README.txt (CSV has no comment syntax in the contract)", () => {
    for (const p of paths.filter((p) => p.endsWith(".yaml"))) expect(text(p)).toMatch(/^# /);
    for (const p of paths.filter((p) => p.endsWith(".csv"))) {
      expect(text(p)).not.toMatch(/^#/m);
      const shown = p.startsWith("intervals/") || p.startsWith("weather/") ? p : p.split("/").pop()!;
      expect(text("README.txt")).toContain(shown);
    }
  });

  it("uses every optional column of bills.csv, buildings.csv and meters.csv", () => {
    expect(text("bills.csv").split("\n")[0]).toBe("meter_id,bill_id,period_start,period_end,usage,read_type,demand,power_factor,total,statement_date");
    expect(text("buildings.csv").split("\n")[0]).toBe("building_id,name,floor_area,area_unit,timezone,weather_station,use_type,tenant_page");
    expect(text("meters.csv").split("\n")[0]).toBe("meter_id,building_id,commodity,unit,tariff,multiplier,account");
  });

  it("is the same on every run (deterministic)", () => {
    expect(starterFiles()).toEqual(files);
  });

  it("checks and builds with zero warnings and zero findings, every row of every file used", async () => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-init-all-"));
    try {
      const starter = join(dir, "starter");
      expect(await runCli(["init", starter], recorder())).toBe(0);
      const check = recorder();
      expect(await runCli(["check", starter, "--json"], check)).toBe(0);
      expect((JSON.parse(check.stdout) as { issues: unknown[] }).issues).toEqual([]);

      const site = join(dir, "site");
      const build = recorder();
      expect(await runCli(["build", starter, "--out", site, "--json", "--fail-on", "warning"], build)).toBe(0);
      const summary = JSON.parse(build.stdout) as { issues: unknown[]; findings: Record<string, number>; billsCheckedExactly: number; bills: number; rowsRejected: number };
      expect(summary.issues).toEqual([]);
      expect(summary.findings).toEqual({ error: 0, warning: 0, info: 0 });
      expect(summary.rowsRejected).toBe(0);
      expect(summary.billsCheckedExactly).toBe(summary.bills);

      const report = JSON.parse(await readFile(join(site, "data", "ingest-report.json"), "utf8")) as { files: { file: string; rowsRead: number; rowsUsed: number; warnings: unknown[] }[] };
      const csvAndYaml = paths.filter((p) => p.endsWith(".csv") || p.endsWith(".yaml")).sort();
      expect(report.files.map((f) => f.file).sort()).toEqual(csvAndYaml);
      for (const f of report.files) {
        expect(f.rowsRead, f.file).toBeGreaterThan(0);
        expect(f.rowsUsed, f.file).toBe(f.rowsRead);
        expect(f.warnings, f.file).toEqual([]);
      }
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  }, 180_000);
});
