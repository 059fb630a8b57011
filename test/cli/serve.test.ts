/**
 * `ohmbook serve` (issue 14, item 3): the findings diff and the rebuild queue as pure pieces,
 * request paths kept inside the site, and one end-to-end run: serve a starter portfolio on a
 * free port, edit a bill, and wait for the served page to show the claim the edit creates.
 */
import { afterEach, describe, expect, it } from "vitest";
import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { diffFindings, describeFindingsDiff, findingKey, isIgnoredInputPath, RebuildQueue, resolveRequestPath, startServe, type FindingRow, type ServeSession } from "../../src/cli/serve.ts";
import { writeStarterPortfolio } from "../../src/cli/init.ts";
import { runCli } from "../../src/cli/main.ts";

function finding(over: Partial<FindingRow>): FindingRow {
  return {
    building_id: "B1",
    meter_id: "M1",
    bill_id: "M1:2024-01-01",
    period_start: "2024-01-01",
    period_end: "2024-02-01",
    check: "total-mismatch",
    severity: "error",
    amount_at_stake: 10,
    message: "Billed 110.00 but the tariff gives 100.00",
    ...over,
  };
}

describe("diffFindings", () => {
  it("reports findings that are new and gone, keyed by check and bill, in input order", () => {
    const kept = finding({});
    const goneOne = finding({ check: "usage-outlier", severity: "warning", amount_at_stake: null });
    const newA = finding({ bill_id: "M1:2024-02-01", period_start: "2024-02-01", period_end: "2024-03-01" });
    const newB = finding({ check: "period-gap", bill_id: null });
    const diff = diffFindings([kept, goneOne], [newA, kept, newB]);
    expect(diff.added).toEqual([newA, newB]);
    expect(diff.gone).toEqual([goneOne]);
    expect(diff.changed).toEqual([]);
  });

  it("a finding whose wording, amount or severity changed is the same finding, reported as changed", () => {
    const before = finding({});
    const reworded = finding({ message: "another sentence" });
    expect(diffFindings([before], [reworded])).toEqual({ added: [], gone: [], changed: [] });
    const bigger = finding({ amount_at_stake: 25, severity: "warning" });
    const diff = diffFindings([before], [bigger]);
    expect(diff.added).toEqual([]);
    expect(diff.gone).toEqual([]);
    expect(diff.changed).toEqual([[before, bigger]]);
    expect(describeFindingsDiff(diff).join("\n")).toMatch(/was error, 10\.00; now 25\.00/);
  });

  it("the same check on another meter, building or period is another finding", () => {
    const base = finding({ bill_id: null });
    for (const other of [finding({ bill_id: null, meter_id: "M2" }), finding({ bill_id: null, building_id: "B2" }), finding({ bill_id: null, period_end: "2024-02-02" })]) {
      expect(findingKey(other)).not.toBe(findingKey(base));
    }
  });

  it("no change prints nothing; changes print one line per finding with its sign", () => {
    expect(describeFindingsDiff(diffFindings([finding({})], [finding({})]))).toEqual([]);
    const lines = describeFindingsDiff(diffFindings([finding({ check: "usage-outlier" })], [finding({})]));
    expect(lines).toEqual([
      "1 new finding(s):",
      "  + error total-mismatch bill M1:2024-01-01 (meter M1, 2024-01-01..2024-02-01): Billed 110.00 but the tariff gives 100.00",
      "1 finding(s) gone:",
      "  - error usage-outlier bill M1:2024-01-01 (meter M1, 2024-01-01..2024-02-01): Billed 110.00 but the tariff gives 100.00",
    ]);
  });
});

describe("RebuildQueue", () => {
  const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

  it("debounces a burst into one build and never overlaps builds; changes during a build make exactly one more", async () => {
    const runs: string[][] = [];
    let active = 0;
    let maxActive = 0;
    let release: (() => void) | null = null;
    const queue = new RebuildQueue(async (changed) => {
      runs.push(changed);
      active++;
      maxActive = Math.max(maxActive, active);
      await new Promise<void>((r) => (release = r));
      active--;
    }, 20);
    queue.notify("bills.csv");
    queue.notify("tariffs/a.yaml");
    queue.notify("bills.csv");
    await sleep(80);
    expect(runs).toEqual([["bills.csv", "tariffs/a.yaml"]]);
    // While the first build runs, three more changes arrive.
    queue.notify("meters.csv");
    await sleep(40);
    queue.notify("tariffs/b.yaml");
    queue.notify("meters.csv");
    await sleep(80);
    expect(runs.length).toBe(1);
    release!();
    await sleep(80);
    expect(runs).toEqual([["bills.csv", "tariffs/a.yaml"], ["meters.csv", "tariffs/b.yaml"]]);
    release!();
    await queue.idle();
    expect(maxActive).toBe(1);
    await queue.close();
  });
});

describe("serving files", () => {
  it("request paths stay inside the site folder", () => {
    const root = "/srv/site";
    expect(resolveRequestPath(root, "/")).toBe("/srv/site");
    expect(resolveRequestPath(root, "/buildings/B%201.html?x=1")).toBe("/srv/site/buildings/B 1.html");
    expect(resolveRequestPath(root, "/../etc/passwd")).toBeNull();
    expect(resolveRequestPath(root, "/..%2f..%2fetc/passwd")).toBeNull();
    expect(resolveRequestPath(root, "/%E0%A4%A")).toBeNull();
  });

  it("editor backups, swap files and dot folders are not inputs", () => {
    for (const p of [".git/index", "bills.csv~", "tariffs/.a.yaml.swp", "intervals/.DS_Store"]) expect(isIgnoredInputPath(p)).toBe(true);
    for (const p of ["bills.csv", "tariffs/a.yaml", "intervals/m1.csv"]) expect(isIgnoredInputPath(p)).toBe(false);
  });

  it("serve --help is in the usage, and a bad --port is a usage error", async () => {
    let out = "";
    let err = "";
    const io = { out: (s: string) => void (out += s), err: (s: string) => void (err += s), isTty: false };
    expect(await runCli(["serve", "--help"], io)).toBe(0);
    expect(out).toMatch(/^Usage: ohmbook serve/);
    out = "";
    expect(await runCli(["help"], io)).toBe(0);
    expect(out).toMatch(/ohmbook serve \[DIR\]/);
    expect(await runCli(["serve", "x", "--port", "http"], io)).toBe(1);
    expect(err).toMatch(/--port must be a number/);
    err = "";
    expect(await runCli(["serve", "no/such/folder"], io)).toBe(1);
    expect(err).toMatch(/no\/such\/folder is not a folder/);
  });

  it("an output folder inside the portfolio is refused before serving starts", async () => {
    const dir = await mkdtemp(join(tmpdir(), "ohmbook-serve-out-"));
    try {
      await writeStarterPortfolio(dir);
      let err = "";
      const io = { out: () => undefined, err: (s: string) => void (err += s), isTty: false };
      expect(await runCli(["serve", dir, "--out", join(dir, "site"), "--port", "0"], io)).toBe(1);
      expect(err).toMatch(/refusing to write the site/);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});

describe("ohmbook serve on a starter portfolio", () => {
  let session: ServeSession | null = null;
  let dir = "";
  afterEach(async () => {
    await session?.close();
    session = null;
    if (dir) await rm(dir, { recursive: true, force: true });
  });

  it("a first build that fails is reported as file:line:column, answers 503 and is retried on the next save", async () => {
    dir = await mkdtemp(join(tmpdir(), "ohmbook-serve-bad-"));
    const portfolio = join(dir, "portfolio");
    await writeStarterPortfolio(portfolio);
    const yamlPath = join(portfolio, "portfolio.yaml");
    const good = await readFile(yamlPath, "utf8");
    await writeFile(yamlPath, good.replace(/^name: .*$/m, "title: no name here"));
    let err = "";
    session = await startServe({ dir: portfolio, port: 0, debounceMs: 100, out: () => undefined, err: (s) => void (err += s) });
    await session.idle();
    expect(session.buildsSucceeded).toBe(0);
    expect(err).toMatch(/portfolio\/portfolio\.yaml:\d+:\d+: error: /);
    const res = await fetch(`${session.url}index.html`);
    expect(res.status).toBe(503);
    expect(await res.text()).toMatch(/no site yet/);
    await writeFile(yamlPath, good);
    const deadline = Date.now() + 90_000;
    while (Date.now() < deadline && session.buildsSucceeded === 0) await new Promise((r) => setTimeout(r, 250));
    await session.idle();
    expect((await fetch(`${session.url}index.html`)).status).toBe(200);
  }, 240_000);

  it("serves the site, rebuilds after a bill is edited, and reports the new finding and the claim", async () => {
    dir = await mkdtemp(join(tmpdir(), "ohmbook-serve-test-"));
    const portfolio = join(dir, "portfolio");
    await writeStarterPortfolio(portfolio);
    let out = "";
    let err = "";
    session = await startServe({ dir: portfolio, port: 0, debounceMs: 100, out: (s) => void (out += s), err: (s) => void (err += s) });
    expect(session.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/$/);
    await session.idle(); // the first build
    expect(session.buildsSucceeded).toBe(1);
    const index = await fetch(`${session.url}index.html`);
    expect(index.status).toBe(200);
    expect(index.headers.get("content-type")).toMatch(/text\/html/);
    expect(await index.text()).toMatch(/<html/);
    const findingsBefore = (await (await fetch(`${session.url}data/findings.json`)).json()) as FindingRow[];
    expect(findingsBefore.filter((f) => f.check === "total-mismatch")).toEqual([]);

    // Raise the first bill's printed total by exactly 100.00: the starter bills match their
    // tariff to the cent, so the audit must now find a 100.00 overcharge (a claim of 100.00).
    const billsPath = join(portfolio, "bills.csv");
    const lines = (await readFile(billsPath, "utf8")).split("\n");
    const totalColumn = lines[0]!.split(",").indexOf("total");
    const cells = lines[1]!.split(",");
    const billed = Number(cells[totalColumn]);
    cells[totalColumn] = (billed + 100).toFixed(2);
    lines[1] = cells.join(",");
    await writeFile(billsPath, lines.join("\n"));

    // Wait (generously) for the served claims to show it; no timing is asserted.
    const deadline = Date.now() + 90_000;
    let claims: { claim_amount: number | string; kind: string }[] = [];
    while (Date.now() < deadline) {
      const res = await fetch(`${session.url}data/disputes.json`);
      expect([200, 404]).toContain(res.status);
      if (res.ok) {
        claims = ((await res.json()) as typeof claims).filter((d) => d.kind === "claim");
        if (claims.length > 0) break;
      }
      await new Promise((r) => setTimeout(r, 250));
    }
    expect(claims.map((c) => Number(c.claim_amount))).toEqual([100]);
    await session.idle();
    const page = await (await fetch(`${session.url}disputes.html`)).text();
    expect(page).toMatch(/100\.00/);
    expect(out).toMatch(/changed: bills\.csv/);
    expect(out).toMatch(/\+ error total-mismatch bill /);
    expect(err).not.toMatch(/internal error/);

    // A broken file is reported as file:line:column and the previous site stays served.
    await writeFile(billsPath, `${lines.join("\n")}\nno-such-meter,2024-13-01,2024-02-01,12,actual,1.00\n`);
    const deadline2 = Date.now() + 90_000;
    while (Date.now() < deadline2 && !/bills\.csv:\d+:\d+: error/.test(err)) await new Promise((r) => setTimeout(r, 250));
    expect(err).toMatch(/portfolio\/bills\.csv:\d+:\d+: error: /);
    expect((await fetch(`${session.url}index.html`)).status).toBe(200);
  }, 240_000);
});
