/**
 * The CLI as a user meets it: exit codes and messages of check, build, init (outputs.md).
 * Builds run on the small starter portfolio from `init` to keep the suite quick.
 */
import { describe, expect, it } from "vitest";
import { mkdtemp, readFile, writeFile, cp, access } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { runCli, type CliIo } from "../../src/cli/main.ts";

function recorder(): CliIo & { stdout: string; stderr: string } {
  const io = { stdout: "", stderr: "", isTty: false } as CliIo & { stdout: string; stderr: string };
  io.out = (s) => void (io.stdout += s);
  io.err = (s) => void (io.stderr += s);
  return io;
}

const exists = (p: string) => access(p).then(() => true, () => false);

describe("ohmbook check", () => {
  it("passes the demo portfolio (exit 0)", async () => {
    const io = recorder();
    expect(await runCli(["check", "data/demo"], io)).toBe(0);
    expect(io.stdout).toMatch(/no errors/);
  });

  it("reports each broken row as file:line:column and exits 1", async () => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-broken-"));
    await cp("data/demo", dir, { recursive: true });
    const bills = (await readFile(join(dir, "bills.csv"), "utf8")).split("\n");
    const header = bills[0]!.split(",");
    const col = (name: string) => header.indexOf(name);
    const row2 = bills[1]!.split(",");
    row2[col("period_start")] = "2024-13-45"; // bad date → line 2
    bills[1] = row2.join(",");
    const row3 = bills[2]!.split(",");
    row3[col("meter_id")] = "NO-SUCH-METER"; // unknown meter → line 3
    bills[2] = row3.join(",");
    const row4 = bills[3]!.split(",");
    row4[col("usage")] = "12abc"; // text in a number → line 4
    bills[3] = row4.join(",");
    await writeFile(join(dir, "bills.csv"), bills.join("\n"));
    const buildings = (await readFile(join(dir, "buildings.csv"), "utf8")).split("\n");
    buildings[1] = buildings[1]!.replace(/^([^,]*),([^,]*|"[^"]*"),/, '$1,"<script>alert(1)</script>",');
    await writeFile(join(dir, "buildings.csv"), buildings.join("\n"));

    const io = recorder();
    expect(await runCli(["check", dir], io)).toBe(1);
    const billsFile = join(dir, "bills.csv");
    expect(io.stdout).toContain(`${billsFile}:2:${col("period_start") + 1}: error`);
    expect(io.stdout).toContain(`${billsFile}:3:${col("meter_id") + 1}: error`);
    expect(io.stdout).toContain(`${billsFile}:4:${col("usage") + 1}: error`);
    // A name with markup is data, not an error: it is kept and escaped on the page.
    expect(io.stdout).not.toMatch(/buildings\.csv:2:\d+: error/);

    // --strict refuses to build and writes nothing.
    const out = join(dir, "..", `${dir.split("/").pop()}-site`);
    const strict = recorder();
    expect(await runCli(["build", dir, "--out", out, "--strict", "--quiet"], strict)).toBe(1);
    expect(strict.stderr).toMatch(/nothing was written/);
    expect(await exists(out)).toBe(false);
  });

  it("a missing required column is fatal for build: exit 1, no output folder", async () => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-fatal-"));
    await runCli(["init", join(dir, "p")], recorder());
    const meters = await readFile(join(dir, "p", "meters.csv"), "utf8");
    await writeFile(join(dir, "p", "meters.csv"), meters.replace("commodity,", "kind,"));
    const io = recorder();
    expect(await runCli(["build", join(dir, "p"), "--out", join(dir, "site")], io)).toBe(1);
    expect(io.stderr).toMatch(/meters\.csv:1:\d+: error/);
    expect(await exists(join(dir, "site"))).toBe(false);
  });
});

describe("ohmbook init + build", () => {
  it("init writes a starter that checks clean and builds; --fail-on error exits 3 on a planted mismatch", async () => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-init-"));
    const starter = join(dir, "starter");
    const init = recorder();
    expect(await runCli(["init", starter], init)).toBe(0);
    expect(await runCli(["init", starter], recorder())).toBe(1); // never overwrites
    expect(await runCli(["check", starter], recorder())).toBe(0);

    const site = join(dir, "site");
    const build = recorder();
    expect(await runCli(["build", starter, "--out", site, "--fail-on", "warning"], build)).toBe(0);
    expect(await exists(join(site, "index.html"))).toBe(true);
    const findings = JSON.parse(await readFile(join(site, "data", "findings.json"), "utf8"));
    expect(findings).toEqual([]);

    // Overcharge the first bill by $100 (hand-computed: the starter's first bill is about $5,600,
    // so 100 is above both cost_abs 1.00 and cost_pct 0.5 %, as a finding needs).
    const bills = (await readFile(join(starter, "bills.csv"), "utf8")).split("\n");
    const totalColumn = bills[0]!.split(",").indexOf("total");
    const cells = bills[1]!.split(",");
    cells[totalColumn] = (Number(cells[totalColumn]) + 100).toFixed(2);
    bills[1] = cells.join(",");
    await writeFile(join(starter, "bills.csv"), bills.join("\n"));
    const failing = recorder();
    expect(await runCli(["build", starter, "--out", site, "--fail-on", "error", "--json"], failing)).toBe(3);
    const summary = JSON.parse(failing.stdout);
    expect(summary.findings.error).toBe(1);
    expect(summary.amountAtStake).toBe(100);
  }, 120_000);

  it("unknown commands and bad options exit 1 with a usage message", async () => {
    const io = recorder();
    expect(await runCli(["frobnicate"], io)).toBe(1);
    expect(io.stderr).toMatch(/unknown command/);
    const bad = recorder();
    expect(await runCli(["build", "--fail-on", "sometimes"], bad)).toBe(1);
    expect(bad.stderr).toMatch(/--fail-on must be/);
    for (const jobs of ["0", "-1", "2.5", "many"]) {
      const r = recorder();
      expect(await runCli(["build", `--jobs=${jobs}`], r)).toBe(1);
      expect(r.stderr).toMatch(/--jobs must be a whole number of worker threads from 1/);
      expect(r.stderr).not.toMatch(/at .*\.ts:\d+/);
    }
  });
});
