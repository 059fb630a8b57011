/**
 * `check` passing means `build` can write every page (issue 16): a portfolio with the problems
 * that used to lose data silently (a stray quote, CR-only line endings, a no-break space after
 * an id, a formula-looking id) builds, every building gets its page, no download carries a
 * non-finite number or a runnable formula, and published files name inputs relative to the
 * portfolio folder.
 */
import { cp, mkdtemp, readFile, readdir, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCli, type CliIo } from "../../src/cli/main.ts";

const dirs: string[] = [];
afterAll(async () => {
  for (const d of dirs) await rm(d, { recursive: true, force: true });
});

async function listAll(dir: string, rel = ""): Promise<string[]> {
  const out: string[] = [];
  for (const e of await readdir(join(dir, rel), { withFileTypes: true })) {
    const r = rel === "" ? e.name : `${rel}/${e.name}`;
    if (e.isDirectory()) out.push(...(await listAll(dir, r)));
    else out.push(r);
  }
  return out;
}

describe("a messy but valid portfolio builds completely", () => {
  it("every building has its page; downloads are finite, formula-safe and path-free", async () => {
    const root = await mkdtemp(join(tmpdir(), "ohmbook-build-robust-"));
    dirs.push(root);
    const dir = join(root, "portfolio");
    const out = join(root, "site");
    await cp("test/fixtures/ingest/good", dir, { recursive: true });
    const bills = (await readFile(join(dir, "bills.csv"), "utf8")).split("\n");
    bills[2] = bills[2].replace(",2024-04-01,", ',"2024-04-01,'); // stray quote: this bill only is rejected
    await writeFile(join(dir, "bills.csv"), bills.join("\n").replace(/^G-200,/gm, "@N1-G\u00A0,"));
    await writeFile(join(dir, "meters.csv"), (await readFile(join(dir, "meters.csv"), "utf8")).replace(/^G-200,/m, "@N1-G,"));
    await writeFile(join(dir, "bill_lines.csv"), (await readFile(join(dir, "bill_lines.csv"), "utf8")).replace(/^G-200:/gm, "@N1-G:"));
    const iv = join(dir, "intervals", "E-100-2024.csv");
    await writeFile(iv, (await readFile(iv, "utf8")).replace(/\n/g, "\r"));

    let stdout = "";
    let stderr = "";
    const io: CliIo = { out: (s) => void (stdout += s), err: (s) => void (stderr += s), isTty: false, sourceDateEpoch: "1700000000" };
    const code = await runCli(["build", dir, "--out", out, "--quiet"], io);
    expect(stderr).not.toMatch(/internal error/);
    expect(code, stderr).toBe(0);
    expect(stderr).toContain(`${dir}/bills.csv:3:2: error:`);

    const files = await listAll(out);
    for (const id of ["LF-01", "LF-02"]) expect(files, id).toContain(`buildings/${id}.html`);
    for (const f of files.filter((p) => p.endsWith(".csv") || p.endsWith(".json") || p.endsWith(".html"))) {
      const text = await readFile(join(out, f), "utf8");
      expect(text.includes(root), `${f} names the build folder`).toBe(false);
      if (f.endsWith(".csv")) {
        expect(text, f).not.toMatch(/(^|,)(-?Infinity|NaN)(,|\r?$)/m);
        // OWASP CSV injection: no cell may start with = + - @ unless it is a plain number.
        for (const line of text.split(/\r?\n/)) {
          for (const cell of line.split(",")) {
            const c = cell.replace(/^"/, "");
            if (/^[=+\-@]/.test(c)) expect(c, `${f}: ${line}`).toMatch(/^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?"?$/);
          }
        }
      }
    }
    const report = JSON.parse(await readFile(join(out, "data", "ingest-report.json"), "utf8")) as { files: { file: string; rowsRead: number; rowsUsed: number; rowsRejected: number }[] };
    expect(report.files.map((f) => f.file)).toContain("bills.csv");
    expect(report.files.find((f) => f.file === "bills.csv")).toMatchObject({ rowsRead: 4, rowsUsed: 3, rowsRejected: 1 });
  }, 120_000);
});
