/**
 * The CLI behaves like the tools people know (issue 14, item 2): `--help` on every command
 * exits 0 with its usage on stdout, `--version`, the current folder is the portfolio when it
 * holds portfolio.yaml, `--quiet` prints only errors, `--json` carries the warnings, and `price`
 * refuses to guess an input the tariff needs unless told to estimate. Exit codes: outputs.md.
 */
import { describe, expect, it } from "vitest";
import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { basename, dirname, join } from "node:path";
import { runCli, type CliIo } from "../../src/cli/main.ts";
import { writeStarterPortfolio } from "../../src/cli/init.ts";

function recorder(extra: Partial<CliIo> = {}): CliIo & { stdout: string; stderr: string } {
  const io = { stdout: "", stderr: "", isTty: false, ...extra } as CliIo & { stdout: string; stderr: string };
  io.out = (s) => void (io.stdout += s);
  io.err = (s) => void (io.stderr += s);
  return io;
}

describe("--help and --version", () => {
  for (const command of ["build", "check", "init", "import", "price"]) {
    for (const flag of ["--help", "-h"]) {
      it(`${command} ${flag} prints its usage and exits 0`, async () => {
        const io = recorder();
        expect(await runCli([command, flag], io)).toBe(0);
        expect(io.stdout).toMatch(new RegExp(`^[Uu]sage: ohmbook ${command}`));
        expect(io.stderr).toBe("");
      });
    }
  }

  it("--help wins over other arguments, as in most CLIs", async () => {
    const io = recorder();
    expect(await runCli(["build", "some/dir", "--no-such-option", "--help"], io)).toBe(0);
    expect(io.stdout).toMatch(/--fail-on/);
  });

  it("help COMMAND is COMMAND --help", async () => {
    const io = recorder();
    expect(await runCli(["help", "check"], io)).toBe(0);
    expect(io.stdout).toMatch(/^Usage: ohmbook check/);
  });

  it("--version prints the version of package.json", async () => {
    const pkg = JSON.parse(await readFile("package.json", "utf8")) as { version: string };
    for (const flag of ["--version", "-v"]) {
      const io = recorder();
      expect(await runCli([flag], io)).toBe(0);
      expect(io.stdout).toBe(`ohmbook ${pkg.version}\n`);
    }
  });

  it("an unknown option is a usage error (exit 1) that says which", async () => {
    const io = recorder();
    expect(await runCli(["check", "--bogus"], io)).toBe(1);
    expect(io.stderr).toMatch(/--bogus/);
  });
});

describe("the portfolio folder defaults to the current folder", () => {
  it("check with no DIR inside a portfolio folder checks that folder", async () => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-cwd-"));
    await writeStarterPortfolio(dir);
    const io = recorder({ cwd: dir });
    expect(await runCli(["check"], io)).toBe(0);
    expect(io.stdout).toContain(dir);
    expect(io.stdout).not.toMatch(/data\/demo/);
    await rm(dir, { recursive: true, force: true });
  });

  it("outside a portfolio folder the demo is the fallback", async () => {
    const io = recorder({ cwd: tmpdir() });
    expect(await runCli(["check"], io)).toBe(0); // the repository's data/demo is clean
    expect(io.stdout).toMatch(/data\/demo: no errors/);
  });
});

/** A starter portfolio with one planted warning: an unknown column in buildings.csv (inputs.md: "unknown columns ignored with one warning per file"). */
async function starterWithWarning(dir: string): Promise<void> {
  await writeStarterPortfolio(dir);
  const path = join(dir, "buildings.csv");
  const [header, ...rows] = (await readFile(path, "utf8")).trimEnd().split("\n");
  await writeFile(path, [`${header},colour`, ...rows.map((r) => `${r},green`)].join("\n") + "\n");
}

describe("--quiet and --json", () => {
  it("check --quiet prints no warning; check --json lists it", async () => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-quiet-"));
    await starterWithWarning(dir);
    const loud = recorder();
    expect(await runCli(["check", dir], loud)).toBe(0);
    expect(loud.stdout).toMatch(/: warning: /);
    const quiet = recorder();
    expect(await runCli(["check", dir, "--quiet"], quiet)).toBe(0);
    expect(quiet.stdout + quiet.stderr).toBe("");
    const json = recorder();
    expect(await runCli(["check", dir, "--json"], json)).toBe(0);
    const parsed = JSON.parse(json.stdout) as { ok: boolean; issues: { severity: string }[] };
    expect(parsed.ok).toBe(true);
    expect(parsed.issues.some((i) => i.severity === "warning")).toBe(true);
    await rm(dir, { recursive: true, force: true });
  });

  it("build --quiet prints nothing but errors; build --json includes the warnings", async () => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-quietb-"));
    await starterWithWarning(dir);
    const quiet = recorder();
    expect(await runCli(["build", dir, "--out", `${dir}-a`, "--quiet"], quiet)).toBe(0);
    expect(quiet.stdout).toBe("");
    expect(quiet.stderr).not.toMatch(/warning/);
    const json = recorder();
    expect(await runCli(["build", dir, "--out", `${dir}-b`, "--json"], json)).toBe(0);
    const parsed = JSON.parse(json.stdout) as { issues: { severity: string; message: string }[] };
    expect(parsed.issues.filter((i) => i.severity === "warning").map((i) => i.message).join("\n")).toMatch(/colour/);
    // The analysis cache sits beside each output folder (.OUT.ohmbook-cache).
    const cacheOf = (out: string) => join(dirname(out), `.${basename(out)}.ohmbook-cache`);
    for (const d of [dir, `${dir}-a`, `${dir}-b`, cacheOf(`${dir}-a`), cacheOf(`${dir}-b`)]) await rm(d, { recursive: true, force: true });
  });
});

describe("price refuses to guess an input the tariff needs", () => {
  // data/demo/tariffs/prairie-gs.yaml has "Demand charge: demand 9.25, minimum_kw 20".
  const base = ["price", "--tariff", "data/demo/tariffs/prairie-gs.yaml", "--usage", "18000", "--from", "2025-06-01", "--to", "2025-07-01"];

  it("a demand tariff without --demand is an error (exit 1) naming the missing input", async () => {
    const io = recorder();
    expect(await runCli(base, io)).toBe(1);
    expect(io.stderr).toMatch(/needs --demand KW/);
    expect(io.stderr).toMatch(/--estimate/);
    expect(io.stdout).toBe("");
  });

  it("with --demand it prices: 92 kW × 9.25 = 851.00 on the demand line", async () => {
    const io = recorder();
    expect(await runCli([...base, "--demand", "92", "--json"], io)).toBe(0);
    const bill = JSON.parse(io.stdout) as { lines: { label: string; amount: number }[] };
    expect(bill.lines.find((l) => l.label === "Demand charge")?.amount).toBe(851);
  });

  it("with --estimate it prices and says what it estimated", async () => {
    const io = recorder();
    expect(await runCli([...base, "--estimate"], io)).toBe(0);
    expect(io.stderr).toMatch(/estimating without --demand/);
    expect(io.stdout).toMatch(/Total/);
  });

  it("a tariff without demand charges needs no --demand", async () => {
    const io = recorder();
    expect(await runCli(["price", "--tariff", "data/demo/tariffs/harrow-gas.yaml", "--usage", "1000", "--from", "2025-01-01", "--to", "2025-02-01"], io)).toBe(0);
    expect(io.stderr).toBe("");
  });
});
