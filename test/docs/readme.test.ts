/**
 * The README's quick start and tutorial, and the `price` examples of docs/tariffs.md, are run as
 * written (issue 14, item 6: tested examples stay tested). The commands are read from the
 * documents' code blocks; the figures the text states (totals, the edit, the claim, the finding
 * line) are checked against what the commands produce on the starter portfolio of `init`.
 */
import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { runCli, type CliIo } from "../../src/cli/main.ts";
import { formatFinding, type FindingRow } from "../../src/cli/serve.ts";

const README = readFileSync(new URL("../../README.md", import.meta.url), "utf8");
const TARIFFS = readFileSync(new URL("../../docs/tariffs.md", import.meta.url), "utf8");

function recorder(): CliIo & { stdout: string; stderr: string } {
  const io = { stdout: "", stderr: "", isTty: false } as CliIo & { stdout: string; stderr: string };
  io.out = (s) => void (io.stdout += s);
  io.err = (s) => void (io.stderr += s);
  return io;
}

/** `npx ohmbook …` commands of the ```sh blocks in `text` (continuation lines joined), as argv. */
function ohmbookCommands(text: string): string[][] {
  const blocks = [...text.matchAll(/```sh\n([\s\S]*?)```/g)].map((m) => m[1]!.replace(/\\\n\s*/g, ""));
  return blocks
    .flatMap((b) => b.split("\n"))
    .map((line) => line.replace(/#.*$/, "").trim())
    .filter((line) => line.startsWith("npx ohmbook "))
    .map((line) => line.slice("npx ohmbook ".length).split(/\s+/));
}

/** Replaces the documents' folder name `my-portfolio` with a real folder. */
function inFolder(argv: string[], folder: string): string[] {
  return argv.map((a) => a.replace(/^my-portfolio/, folder));
}

function section(text: string, heading: string): string {
  const start = text.indexOf(heading);
  expect(start, heading).toBeGreaterThanOrEqual(0);
  const next = text.indexOf("\n## ", start + heading.length);
  return text.slice(start, next < 0 ? undefined : next);
}

function billRow(csv: string, billId: string): { cells: string[]; header: string[]; index: number; lines: string[] } {
  const lines = csv.split("\n");
  const header = lines[0]!.split(",");
  const index = lines.findIndex((l) => l.split(",")[header.indexOf("bill_id")] === billId);
  expect(index, billId).toBeGreaterThan(0);
  return { cells: lines[index]!.split(","), header, index, lines };
}

describe("README quick start", () => {
  it("is the two commands CI and a fresh clone run", () => {
    const quick = section(README, "## Quick start");
    expect(quick).toContain("npm ci && npm run demo");
    expect(quick).toMatch(/^npm test\b/m);
  });
});

describe("README tutorial, from init to a first dispute", () => {
  const tutorial = section(README, "## Tutorial");
  const commands = ohmbookCommands(tutorial);

  it("uses init, check, serve and price, in that order", () => {
    expect(commands.map((c) => c[0])).toEqual(["init", "check", "serve", "price"]);
  });

  it("runs as written: the stated total, edit, finding, claim and follow-ups are what ohmbook does", async () => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-tutorial-"));
    const folder = join(dir, "my-portfolio");
    try {
      // 1. init
      expect(await runCli(inFolder(commands[0]!, folder), recorder())).toBe(0);
      // 2. check: the line the tutorial quotes.
      const check = recorder();
      expect(await runCli(inFolder(commands[1]!, folder), check)).toBe(0);
      const quotedCheck = /It prints `my-portfolio: (no errors \(0 warning\(s\)\))`/.exec(tutorial)?.[1];
      expect(quotedCheck).toBeDefined();
      expect(check.stdout.trim()).toBe(`${folder}: ${quotedCheck}`);
      // 3. serve is covered by test/cli/serve.test.ts; here the same site is built once.
      expect(tutorial).toMatch(/every one of the (\d+) bills matches its tariff/);
      const billCount = Number(/every one of the (\d+) bills/.exec(tutorial)![1]);
      const site = join(dir, "site");
      const first = recorder();
      expect(await runCli(["build", folder, "--out", site, "--json"], first)).toBe(0);
      const firstSummary = JSON.parse(first.stdout) as { bills: number; billsCheckedExactly: number; claims: { count: number } };
      expect(firstSummary.bills).toBe(billCount);
      expect(firstSummary.billsCheckedExactly).toBe(billCount);
      expect(firstSummary.claims.count).toBe(0);

      // 4. price: the stated total is the bill's total.
      const [, statedTotal, billId] = /the total, ([\d,]+\.\d\d), is\s+the `total` of bill `([^`]+)`/.exec(tutorial) ?? [];
      expect(billId).toBeDefined();
      const price = recorder();
      expect(await runCli(inFolder(commands[3]!, folder), price)).toBe(0);
      expect(price.stdout).toMatch(new RegExp(`^Total\\s+${statedTotal!.replace(/[.,]/g, "\\$&")}$`, "m"));
      const billsPath = join(folder, "bills.csv");
      const row = billRow(await readFile(billsPath, "utf8"), billId!);
      const totalColumn = row.header.indexOf("total");
      expect(row.cells[totalColumn]).toBe(statedTotal!.replace(/,/g, ""));

      // 5. the edit, and the finding line serve prints.
      const [, from, to] = /change its `total` from `([\d.]+)` to `([\d.]+)`/.exec(tutorial) ?? [];
      expect(from).toBe(row.cells[totalColumn]);
      row.cells[totalColumn] = to!;
      row.lines[row.index] = row.cells.join(",");
      await writeFile(billsPath, row.lines.join("\n"));
      const second = recorder();
      expect(await runCli(["build", folder, "--out", site, "--json"], second)).toBe(0);
      const findings = JSON.parse(await readFile(join(site, "data", "findings.json"), "utf8")) as { check: string; severity: string; bill_id: string; message: string }[];
      const quotedFinding = /^ {2}\+ (\w+) ([\w-]+) bill (\S+) \(.*?\): (.*)$/m.exec(tutorial);
      expect(quotedFinding).not.toBeNull();
      expect(findings.map((f) => [f.severity, f.check, f.bill_id, f.message])).toEqual([[quotedFinding![1], quotedFinding![2], quotedFinding![3], quotedFinding![4]]]);
      // …and the line is the one serve prints for it.
      expect(formatFinding("+", findings[0] as unknown as FindingRow)).toBe(quotedFinding![0]);

      // 6. the claim on disputes.html and in data/disputes.csv.
      const statedClaim = /one claim of ([\d,]+\.\d\d) USD/.exec(tutorial)?.[1];
      expect(statedClaim).toBeDefined();
      const disputes = JSON.parse(await readFile(join(site, "data", "disputes.json"), "utf8")) as { kind: string; claim_amount: number | string; bill_ids: string }[];
      expect(disputes.map((d) => [d.kind, Number(d.claim_amount).toFixed(2), d.bill_ids])).toEqual([["claim", statedClaim, billId]]);
      expect(await readFile(join(site, "disputes.html"), "utf8")).toContain(statedClaim);
      // The tutorial's arithmetic: the claim is the edit.
      expect((Number(to) - Number(from)).toFixed(2)).toBe(statedClaim);

      // 7a. `abc` in a usage cell: a file:line:column error.
      const usageColumn = row.header.indexOf("usage");
      const broken = [...row.lines];
      const cells = broken[row.index]!.split(",");
      cells[usageColumn] = "abc";
      broken[row.index] = cells.join(",");
      await writeFile(billsPath, broken.join("\n"));
      const bad = recorder();
      expect(await runCli(["check", folder], bad)).toBe(1);
      expect(bad.stdout).toContain(`${folder}/bills.csv:${row.index + 1}:${usageColumn + 1}: error:`);
      await writeFile(billsPath, row.lines.join("\n"));

      // 7b. the gas price raised as stated: that many new findings, each a bill too low.
      const [, gasFile, oldPrice, newPrice] = /price in `my-portfolio\/([^`]+)` from `([\d.]+)` to `([\d.]+)`/.exec(tutorial) ?? [];
      const statedCount = Number(/lists (\d+) new findings/.exec(tutorial)?.[1]);
      const gasPath = join(folder, gasFile!);
      const gas = await readFile(gasPath, "utf8");
      expect(gas).toContain(`energy: ${oldPrice}`);
      await writeFile(gasPath, gas.replace(`energy: ${oldPrice}`, `energy: ${newPrice}`));
      const third = recorder();
      expect(await runCli(["build", folder, "--out", site, "--json"], third)).toBe(0);
      const after = JSON.parse(await readFile(join(site, "data", "findings.json"), "utf8")) as { bill_id: string; amount_at_stake: number | null }[];
      const newOnes = after.filter((f) => f.bill_id !== billId);
      expect(newOnes.length).toBe(statedCount);
      for (const f of newOnes) expect(f.amount_at_stake).toBeLessThan(0);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  }, 240_000);
});

describe("docs/tariffs.md, Checking a file", () => {
  it("each price example prints the total the text states, which is the bill's total in bills.csv", async () => {
    const text = section(TARIFFS, "## Checking a file");
    const commands = ohmbookCommands(text).filter((c) => c[0] === "price");
    expect(commands.length).toBe(2);
    const stated = [...text.matchAll(/([A-Z]\d-\d{4}-\d\d): ([\d.]+)/g)].map((m) => ({ billId: m[1]!, total: m[2]! }));
    expect(stated.length).toBe(2);
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-docs-price-"));
    const folder = join(dir, "my-portfolio");
    try {
      expect(await runCli(["init", folder], recorder())).toBe(0);
      const bills = await readFile(join(folder, "bills.csv"), "utf8");
      for (const [i, argv] of commands.entries()) {
        const io = recorder();
        expect(await runCli(inFolder(argv, folder), io), io.stderr).toBe(0);
        const printed = /^Total\s+([\d,]+\.\d\d)$/m.exec(io.stdout)?.[1]?.replace(/,/g, "");
        expect(printed).toBe(stated[i]!.total);
        const row = billRow(bills, stated[i]!.billId);
        expect(row.cells[row.header.indexOf("total")]).toBe(stated[i]!.total);
      }
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  }, 120_000);
});
