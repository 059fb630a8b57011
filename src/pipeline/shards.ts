/**
 * Sharded builds: `build --shard K/N --partial OUT_K` analyses only the buildings of shard K
 * (a stable hash of the building id) and writes their analyses — the same plain results the
 * incremental cache keeps (analysisCache.ts) — with a manifest; `merge OUT_1 … OUT_N --out SITE`
 * checks the manifests, gathers every analysis and runs the portfolio-level stages (disputes,
 * forecast, pages) once, reading each building's analysis instead of computing it. The merged
 * site is byte-identical to a one-machine build because the analyses are.
 */
import { createHash } from "node:crypto";
import { copyFile, mkdir, readdir, readFile, rename, rm, writeFile } from "node:fs/promises";
import { basename, dirname, join, resolve } from "node:path";
import { OhmbookError, UsageError } from "../core/errors.ts";
import { fnv1a32 } from "../core/random.ts";

/** Bump when the partial folder's layout or manifest changes. */
export const PARTIAL_FORMAT = "ohmbook-partial/1";

/** Shard K of N, K from 1. */
export interface ShardSpec {
  index: number;
  count: number;
}

export interface PartialManifest {
  format: string;
  /** Fingerprint of the program (version, code, lock file): partials of different programs do not mix. */
  program: string;
  shard: ShardSpec;
  /** The portfolio folder the shard read (absolute), for `merge` without --portfolio. */
  portfolio: string;
  /** Digest of every building id of the portfolio, so shards of different portfolios do not mix. */
  portfolioBuildings: string;
  /** Buildings this shard analysed, in portfolio order. */
  buildings: string[];
}

/** The shard (1 … count) a building belongs to: a stable hash of its id, the same on every machine. */
export function shardOf(buildingId: string, count: number): number {
  return 1 + (fnv1a32(buildingId) % count);
}

/** Digest of a portfolio's building ids (sorted). */
export function buildingsDigest(buildingIds: readonly string[]): string {
  return createHash("sha256").update([...buildingIds].sort().join("\n")).digest("hex");
}

/**
 * `--shard K/N`, or `--shard auto` read from the batch engine's environment:
 * a Kubernetes Indexed Job (JOB_COMPLETION_INDEX from 0, with the completions count set as
 * JOB_COMPLETIONS in the manifest) or a Slurm job array (SLURM_ARRAY_TASK_ID from
 * SLURM_ARRAY_TASK_MIN, SLURM_ARRAY_TASK_COUNT).
 * @throws UsageError naming what is wrong.
 * @example parseShard("2/4", {}) // { index: 2, count: 4 }
 */
export function parseShard(text: string, env: Readonly<Record<string, string | undefined>>): ShardSpec {
  const whole = (name: string, v: string | undefined): number => {
    if (v === undefined || !/^\d{1,6}$/.test(v)) throw new UsageError(`--shard auto: ${name} is ${v === undefined ? "not set" : `'${v.slice(0, 20)}', not a whole number`}`);
    return Number(v);
  };
  let spec: ShardSpec;
  if (text === "auto") {
    if (env.JOB_COMPLETION_INDEX !== undefined) {
      spec = { index: whole("JOB_COMPLETION_INDEX", env.JOB_COMPLETION_INDEX) + 1, count: whole("JOB_COMPLETIONS (set it to the job's completions)", env.JOB_COMPLETIONS) };
    } else if (env.SLURM_ARRAY_TASK_ID !== undefined) {
      const min = env.SLURM_ARRAY_TASK_MIN === undefined ? 0 : whole("SLURM_ARRAY_TASK_MIN", env.SLURM_ARRAY_TASK_MIN);
      spec = { index: whole("SLURM_ARRAY_TASK_ID", env.SLURM_ARRAY_TASK_ID) - min + 1, count: whole("SLURM_ARRAY_TASK_COUNT", env.SLURM_ARRAY_TASK_COUNT) };
    } else {
      throw new UsageError("--shard auto found neither a Kubernetes Indexed Job (JOB_COMPLETION_INDEX) nor a Slurm array (SLURM_ARRAY_TASK_ID); give --shard K/N");
    }
  } else {
    const m = /^(\d{1,6})\/(\d{1,6})$/.exec(text);
    if (!m) throw new UsageError(`--shard must be K/N (e.g. 2/4) or auto, got '${text.slice(0, 40)}'`);
    spec = { index: Number(m[1]), count: Number(m[2]) };
  }
  if (!(spec.count >= 1 && spec.index >= 1 && spec.index <= spec.count)) {
    throw new UsageError(`shard ${spec.index} of ${spec.count} does not exist: K must be 1 … N`);
  }
  return spec;
}

/** Where a partial folder keeps its analyses (cache entries). */
export function partialAnalysesDir(partialDir: string): string {
  return join(partialDir, "analyses");
}

/** Writes the manifest last, atomically: a partial without one is incomplete and merge refuses it. */
export async function writeManifest(partialDir: string, manifest: PartialManifest): Promise<void> {
  const target = join(partialDir, "partial.json");
  const temporary = `${target}.${process.pid}.tmp`;
  await writeFile(temporary, `${JSON.stringify(manifest, null, 2)}\n`);
  await rename(temporary, target);
}

/** Makes `partialDir` ready for a shard: created, or an earlier partial's contents removed. */
export async function preparePartialDir(partialDir: string): Promise<void> {
  const names = await readdir(partialDir).catch(() => null);
  if (names !== null && names.length > 0 && !names.includes("partial.json") && !names.includes("analyses")) {
    throw new UsageError(`--partial ${partialDir} is a folder with other files in it; give an empty or new folder`);
  }
  await rm(join(partialDir, "partial.json"), { force: true });
  await rm(partialAnalysesDir(partialDir), { recursive: true, force: true });
  await mkdir(partialAnalysesDir(partialDir), { recursive: true });
}

export interface GatheredPartials {
  portfolio: string;
  /** A temporary folder holding every shard's analyses (remove it when done). */
  analysesDir: string;
  manifests: PartialManifest[];
}

/**
 * Reads and checks the partial folders and gathers their analyses in a temporary folder beside
 * `outDir`. Refuses a missing or doubled shard, a mix of programs, counts or portfolios.
 * @throws OhmbookError with a message naming the problem.
 */
export async function gatherPartials(dirs: readonly string[], outDir: string, program: string): Promise<GatheredPartials> {
  if (dirs.length === 0) throw new UsageError("merge needs the partial folders: ohmbook merge OUT_1 … OUT_N --out SITE");
  const manifests: PartialManifest[] = [];
  for (const dir of dirs) {
    let m: PartialManifest;
    try {
      m = JSON.parse(await readFile(join(dir, "partial.json"), "utf8")) as PartialManifest;
    } catch {
      throw new OhmbookError(`${dir}: no readable partial.json; that shard did not finish (run its build --shard again)`);
    }
    if (m.format !== PARTIAL_FORMAT) throw new OhmbookError(`${dir}: partial format '${String(m.format).slice(0, 40)}', this ohmbook reads '${PARTIAL_FORMAT}'`);
    if (m.program !== program) throw new OhmbookError(`${dir}: made by a different ohmbook (program ${m.program.slice(0, 12)}…, this one ${program.slice(0, 12)}…); build every shard and merge with the same version`);
    manifests.push(m);
  }
  const count = manifests[0]!.shard.count;
  const seen = new Map<number, string>();
  manifests.forEach((m, i) => {
    if (m.shard.count !== count) throw new OhmbookError(`${dirs[i]}: shard ${m.shard.index} of ${m.shard.count}, but ${dirs[0]} is of ${count}`);
    if (m.portfolioBuildings !== manifests[0]!.portfolioBuildings) throw new OhmbookError(`${dirs[i]}: built from a portfolio with other buildings than ${dirs[0]}`);
    const twice = seen.get(m.shard.index);
    if (twice) throw new OhmbookError(`shard ${m.shard.index} of ${count} is given twice: ${twice} and ${dirs[i]}`);
    seen.set(m.shard.index, dirs[i]!);
  });
  const missing = Array.from({ length: count }, (_, k) => k + 1).filter((k) => !seen.has(k));
  if (missing.length > 0) throw new OhmbookError(`shard(s) ${missing.join(", ")} of ${count} missing; give every partial folder`);
  const out = resolve(outDir);
  const analysesDir = join(dirname(out), `.${basename(out)}.ohmbook-merge-${process.pid}`);
  await rm(analysesDir, { recursive: true, force: true });
  await mkdir(analysesDir, { recursive: true });
  for (const dir of dirs) {
    const from = partialAnalysesDir(dir);
    for (const name of await readdir(from)) if (name.endsWith(".v8")) await copyFile(join(from, name), join(analysesDir, name));
  }
  return { portfolio: manifests[0]!.portfolio, analysesDir, manifests };
}
