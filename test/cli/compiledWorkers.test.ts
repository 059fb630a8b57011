// The worker pool from the compiled CLI (package.json `prepare`: esbuild bundles the CLI and the
// worker entry side by side): a build with --jobs 2 finds dist/cli/analyseWorker.js and writes
// the same site as the TypeScript source in one thread.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFileSync, spawnSync } from "node:child_process";
import { mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import { join, relative, resolve } from "node:path";
import { tmpdir } from "node:os";
import { buildPortfolioSite } from "../../src/pipeline/build.ts";

const ROOT = resolve(import.meta.dirname, "..", "..");

async function listFiles(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const entry of await readdir(dir, { withFileTypes: true, recursive: true })) {
    if (entry.isFile()) out.push(relative(dir, join(entry.parentPath, entry.name)));
  }
  return out.sort();
}

describe("compiled CLI with worker threads", () => {
  let compiled: string;
  let work: string;
  beforeAll(async () => {
    // Inside the project (as dist/ is), so the compiled code finds content/ two folders up.
    compiled = await mkdtemp(join(ROOT, ".ohmbook-tmp-dist-"));
    work = await mkdtemp(join(tmpdir(), "ohmbook-compiled-"));
    const pkg = JSON.parse(await readFile(join(ROOT, "package.json"), "utf8")) as { scripts: Record<string, string> };
    const args = pkg.scripts.prepare!.replace(/^esbuild\s+/, "").split(/\s+/).map((a) => (a.startsWith("--outdir=") ? `--outdir=${join(compiled, "cli")}` : a));
    execFileSync(join(ROOT, "node_modules", ".bin", "esbuild"), args, { cwd: ROOT, stdio: "pipe" });
  }, 120_000);
  afterAll(async () => {
    await rm(compiled, { recursive: true, force: true });
    await rm(work, { recursive: true, force: true });
  });

  it("bundles the worker entry beside the CLI and builds with --jobs 2 the same site as one thread", async () => {
    expect((await readdir(join(compiled, "cli"))).filter((f) => f === "main.js" || f === "analyseWorker.js").sort()).toEqual(["analyseWorker.js", "main.js"]);
    const dir = "test/fixtures/spec-portfolio";
    const run = spawnSync(process.execPath, [join(compiled, "cli", "main.js"), "build", dir, "--out", join(work, "compiled"), "--jobs", "2", "--quiet"], { cwd: ROOT, encoding: "utf8", env: { ...process.env, SOURCE_DATE_EPOCH: "" } });
    expect(run.stderr).not.toMatch(/internal error|Cannot find module/);
    expect(run.status).toBe(0);
    await buildPortfolioSite({ dir, outDir: join(work, "source"), strict: false, jobs: 1 });
    const files = await listFiles(join(work, "source"));
    expect(await listFiles(join(work, "compiled"))).toEqual(files);
    for (const f of files) {
      const [a, b] = await Promise.all([readFile(join(work, "source", f)), readFile(join(work, "compiled", f))]);
      expect(b.equals(a), f).toBe(true);
    }
  }, 240_000);
});
