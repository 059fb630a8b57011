// Issue 17, "shards": 4 shards and a merge write the site a one-machine build writes, byte for
// byte; merge refuses a missing or repeated shard and partials of another portfolio; --shard auto
// reads the index from a Kubernetes Indexed Job or a Slurm array as the deploy/ examples set it.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cp, mkdtemp, readdir, readFile, rm, writeFile } from "node:fs/promises";
import { join, relative } from "node:path";
import { tmpdir } from "node:os";
import { buildPortfolioSite, buildShard, mergeShards, parseShard } from "../../src/pipeline/index.ts";
import { shardOf } from "../../src/pipeline/shards.ts";
import { OhmbookError } from "../../src/core/errors.ts";

async function listFiles(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const entry of await readdir(dir, { withFileTypes: true, recursive: true })) {
    if (entry.isFile()) out.push(relative(dir, join(entry.parentPath, entry.name)));
  }
  return out.sort();
}

const BUILD_DATE = "2026-01-15";

describe("sharded build and merge", () => {
  let work: string;
  let dir: string;
  const partials: string[] = [];
  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-shards-"));
    dir = join(work, "portfolio");
    await cp("test/fixtures/spec-portfolio", dir, { recursive: true });
    for (let k = 1; k <= 4; k++) {
      const partial = join(work, `part-${k}`);
      await buildShard({ dir, shard: { index: k, count: 4 }, partialDir: partial, strict: false, jobs: 1 });
      partials.push(partial);
    }
  }, 240_000);
  afterAll(async () => {
    await rm(work, { recursive: true, force: true });
  });

  it("every building is in exactly one shard, by a stable hash of its id", async () => {
    const manifests = await Promise.all(partials.map(async (p) => JSON.parse(await readFile(join(p, "partial.json"), "utf8")) as { buildings: string[]; shard: { index: number } }));
    const all = manifests.flatMap((m) => m.buildings).sort();
    expect(new Set(all).size).toBe(all.length);
    expect(all.length).toBeGreaterThanOrEqual(3);
    for (const m of manifests) for (const b of m.buildings) expect(shardOf(b, 4)).toBe(m.shard.index);
  });

  it("4 shards + merge give the one-machine site, byte for byte", async () => {
    const one = join(work, "one");
    await buildPortfolioSite({ dir, outDir: one, strict: false, jobs: 1, buildDate: BUILD_DATE });
    const merged = join(work, "merged");
    // Shards given in any order; the portfolio folder comes from their manifests.
    const result = await mergeShards({ partials: [...partials].reverse(), outDir: merged, strict: false, buildDate: BUILD_DATE });
    expect(result.summary.buildingsFromCache).toBe(result.summary.buildings);
    const files = await listFiles(one);
    expect(await listFiles(merged)).toEqual(files);
    for (const f of files) expect((await readFile(join(merged, f))).equals(await readFile(join(one, f))), f).toBe(true);
    // The scratch folders of the shards and builds (interval readings on disk, the site being
    // written) are gone once they end.
    expect((await readdir(work)).filter((name) => name.includes(".ohmbook-build-"))).toEqual([]);
  }, 240_000);

  it("refuses a missing shard, a shard given twice, and a mix with another portfolio's partials", async () => {
    await expect(mergeShards({ partials: partials.slice(0, 3), outDir: join(work, "m1"), strict: false })).rejects.toThrow(/shard\(s\) 4 of 4 missing/);
    await expect(mergeShards({ partials: [...partials, partials[0]!], outDir: join(work, "m2"), strict: false })).rejects.toThrow(/given twice/);
    const other = join(work, "other");
    await cp(dir, other, { recursive: true });
    const buildings = await readFile(join(other, "buildings.csv"), "utf8");
    const firstId = buildings.split("\n")[1]!.split(",")[0]!;
    await writeFile(join(other, "buildings.csv"), buildings.replace(new RegExp(`^${firstId},`, "m"), `${firstId}-X,`).replace(/\n$/, "\n"));
    const meters = await readFile(join(other, "meters.csv"), "utf8");
    await writeFile(join(other, "meters.csv"), meters.replace(new RegExp(`,${firstId},`, "g"), `,${firstId}-X,`));
    const stray = join(work, "stray-1");
    await buildShard({ dir: other, shard: { index: 1, count: 4 }, partialDir: stray, strict: false, jobs: 1 });
    await expect(mergeShards({ partials: [stray, ...partials.slice(1)], outDir: join(work, "m3"), strict: false })).rejects.toThrow(/other buildings/);
  }, 240_000);

  it("a shard built from other inputs is refused at merge, never analysed there", async () => {
    const changed = join(work, "changed");
    await cp(dir, changed, { recursive: true });
    const bills = await readFile(join(changed, "bills.csv"), "utf8");
    const lines = bills.split("\n");
    const cells = lines[1]!.split(",");
    cells[4] = String(Number(cells[4]) + 1); // one more unit of usage on the first bill
    lines[1] = cells.join(",");
    await writeFile(join(changed, "bills.csv"), lines.join("\n"));
    await expect(mergeShards({ partials, dir: changed, outDir: join(work, "m4"), strict: false })).rejects.toThrow(OhmbookError);
  }, 240_000);
});

describe("--shard", () => {
  it("K/N, and auto from a Kubernetes Indexed Job or a Slurm array", () => {
    expect(parseShard("2/4", {})).toEqual({ index: 2, count: 4 });
    // deploy/kubernetes-indexed-job.yaml: completions 4, JOB_COMPLETIONS set to the same.
    expect(parseShard("auto", { JOB_COMPLETION_INDEX: "0", JOB_COMPLETIONS: "4" })).toEqual({ index: 1, count: 4 });
    expect(parseShard("auto", { JOB_COMPLETION_INDEX: "3", JOB_COMPLETIONS: "4" })).toEqual({ index: 4, count: 4 });
    // deploy/slurm-array.sh: #SBATCH --array=1-4
    expect(parseShard("auto", { SLURM_ARRAY_TASK_ID: "3", SLURM_ARRAY_TASK_MIN: "1", SLURM_ARRAY_TASK_COUNT: "4" })).toEqual({ index: 3, count: 4 });
    expect(parseShard("auto", { SLURM_ARRAY_TASK_ID: "0", SLURM_ARRAY_TASK_MIN: "0", SLURM_ARRAY_TASK_COUNT: "4" })).toEqual({ index: 1, count: 4 });
    expect(() => parseShard("auto", {})).toThrow(/neither a Kubernetes/);
    expect(() => parseShard("5/4", {})).toThrow(/does not exist/);
    expect(() => parseShard("auto", { JOB_COMPLETION_INDEX: "0" })).toThrow(/JOB_COMPLETIONS/);
  });
});

describe("deploy/ examples", () => {
  it("the Kubernetes Indexed Job: 4 completions, JOB_COMPLETIONS matching, every index's partial merged", async () => {
    const { parseAllDocuments } = await import("yaml");
    const docs = parseAllDocuments(await readFile("deploy/kubernetes-indexed-job.yaml", "utf8")).map((d) => d.toJS());
    const shards = docs.find((d) => d.metadata.name === "ohmbook-shards");
    expect(shards.spec.completionMode).toBe("Indexed");
    const n = shards.spec.completions as number;
    const container = shards.spec.template.spec.containers[0];
    const completions = container.env.find((e: { name: string }) => e.name === "JOB_COMPLETIONS").value;
    expect(Number(completions)).toBe(n);
    expect(container.command.join(" ")).toMatch(/build \S+ --shard auto --partial \S+partial-\$\(JOB_COMPLETION_INDEX\)/);
    for (let i = 0; i < n; i++) expect(parseShard("auto", { JOB_COMPLETION_INDEX: String(i), JOB_COMPLETIONS: completions })).toEqual({ index: i + 1, count: n });
    const merge = docs.find((d) => d.metadata.name === "ohmbook-merge").spec.template.spec.containers[0].command.join(" ");
    for (let i = 0; i < n; i++) expect(merge).toContain(`partial-${i}`);
  });
  it("the Slurm array: --array=1-N, shard auto, every task's partial merged", async () => {
    const script = await readFile("deploy/slurm-array.sh", "utf8");
    const [, lo, hi] = /#SBATCH --array=(\d+)-(\d+)/.exec(script)!;
    const n = Number(hi) - Number(lo) + 1;
    expect(script).toMatch(/--shard auto --partial "\$WORK\/partial-\$SLURM_ARRAY_TASK_ID"/);
    for (let id = Number(lo); id <= Number(hi); id++) {
      expect(parseShard("auto", { SLURM_ARRAY_TASK_ID: String(id), SLURM_ARRAY_TASK_MIN: lo, SLURM_ARRAY_TASK_COUNT: String(n) })).toEqual({ index: id - Number(lo) + 1, count: n });
      expect(script).toContain(`$WORK/partial-${id}`);
    }
  });
  it("the CI matrix: shards 1…N passed as K/N, every partial merged", async () => {
    const { parse } = await import("yaml");
    const wf = parse(await readFile("deploy/github-actions-matrix.yml", "utf8"));
    const shards = wf.jobs.shard.strategy.matrix.shard as number[];
    const n = shards.length;
    expect(shards).toEqual(Array.from({ length: n }, (_, k) => k + 1));
    const build = wf.jobs.shard.steps.map((s: { run?: string }) => s.run ?? "").find((r: string) => r.includes("--shard"));
    expect(build).toContain(`--shard \${{ matrix.shard }}/${n}`);
    for (const k of shards) expect(parseShard(`${k}/${n}`, {})).toEqual({ index: k, count: n });
    const merge = wf.jobs.merge.steps.map((s: { run?: string }) => s.run ?? "").find((r: string) => r.includes("merge"));
    for (const k of shards) expect(merge).toContain(`partial-${k}`);
  });
});
