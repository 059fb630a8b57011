/**
 * Incremental rebuilds: each building's analysis (its plain results, buildingTask.ts) kept in a
 * cache folder under a key made of everything it depends on, so a build after a change
 * re-analyses only the buildings whose inputs changed. The key is a SHA-256 of
 * - the program: ohmbook's version and a fingerprint of its code (every file of src/, or of the
 *   compiled dist/cli, and package-lock.json, so any code or dependency change misses);
 * - the building's task: its slice of the portfolio (bills, lines, interval series and masks,
 *   weather) and the portfolio's settings, hashed by content (contentHash);
 * - the portfolio's tariffs, hashed once per build (keyTariffs).
 * Entries are node:v8-serialized results, written atomically (temporary file, then rename), so
 * concurrent builds sharing a cache cannot read half an entry; an unreadable entry is a miss.
 * Entries no build has used for PRUNE_AFTER_DAYS are removed.
 */
import { createHash } from "node:crypto";
import { existsSync, readFileSync, renameSync, rmSync, statSync, utimesSync, writeFileSync } from "node:fs";
import { mkdir, readdir, readFile, rename, rm, stat, utimes, writeFile } from "node:fs/promises";
import { basename, dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { serialize } from "node:v8";
import { deserializeOwned } from "../core/deserializeOwned.ts";
import type { BuildingTask, PlainResults } from "./buildingTask.ts";
import type { Memo } from "../core/memo.ts";
import { contentHash, hashFolder, withContentDigest } from "../core/contentHash.ts";
import type { BuildingResults } from "../report/index.ts";

/** Bump when the entry format or the key's recipe changes. */
const FORMAT = "ohmbook-analysis-cache/2";
const PRUNE_AFTER_DAYS = 30;

export interface AnalysisCache {
  dir: string;
  /** Hash of the program (version, code, lock file). */
  program: string;
  /** Hash of the portfolio's tariffs (every task carries them all: hashed once per build). */
  tariffs: string;
  /** Keys used by this build (their entries are kept fresh). */
  used: Set<string>;
  hits: number;
}

/** The default cache folder: beside the output folder (`_site` → `.​_site.ohmbook-cache`), never in it. */
export function defaultCacheDir(outDir: string): string {
  const out = resolve(outDir);
  return join(dirname(out), `.${basename(out)}.ohmbook-cache`);
}

/** The program's fingerprint: the code this module runs from (src/ or dist/cli) and the lock file. */
export function programFingerprint(): string {
  const here = fileURLToPath(import.meta.url);
  const root = resolve(dirname(here), "..", "..");
  const hash = createHash("sha256").update(FORMAT);
  hashFolder(hash, here.endsWith(".ts") ? join(root, "src") : dirname(here), /\.(ts|mts|js|mjs|json)$/);
  for (const name of ["package.json", "package-lock.json"]) {
    const path = join(root, name);
    if (existsSync(path) && statSync(path).isFile()) hash.update(readFileSync(path));
  }
  return hash.digest("hex");
}

/** Opens (creates) the cache folder `dir`. */
export async function openAnalysisCache(dir: string): Promise<AnalysisCache> {
  await mkdir(dir, { recursive: true });
  return { dir: resolve(dir), program: programFingerprint(), tariffs: "", used: new Set(), hits: 0 };
}

/** Takes the tariffs' hash (call once per build, before the first building is analysed). */
export function keyTariffs(cache: AnalysisCache, tariffs: ReadonlyMap<string, unknown>): void {
  cache.tariffs = contentHash(tariffs);
}

/** The key of a building's analysis: program and task. */
export function cacheKey(cache: AnalysisCache, task: BuildingTask): string {
  const own = { ...task, onBug: null, portfolio: { ...task.portfolio, tariffs: null } };
  return createHash("sha256").update(cache.program).update(cache.tariffs).update(contentHash(own)).digest("hex");
}

/**
 * Gives each bill's pricing and each meter's baseline in `results` (the analysis whose cache key
 * is `key`) a content digest made from that key and the bill's or meter's id
 * (core/contentHash.ts withContentDigest): the key names everything the analysis read, so it
 * names each of its results too, and the building's page key hashes a digest per bill and meter
 * instead of every priced line and model point again. Nothing changes them after the analysis.
 */
export function digestAnalysis(results: Pick<BuildingResults, "priced" | "baselines">, key: string): void {
  for (const [billId, priced] of results.priced) withContentDigest(priced, contentHash(["analysed pricing", key, billId]));
  results.baselines.forEach((b, i) => withContentDigest(b, contentHash(["analysed baseline", key, i, b.meterId])));
}

function entryPath(cache: AnalysisCache, key: string): string {
  return join(cache.dir, `${key}.v8`);
}

/** Whether `key` has an entry (reading it may still fail; the building is then analysed). */
export function isCached(cache: AnalysisCache, key: string): boolean {
  return existsSync(entryPath(cache, key));
}

/** The cached results of `key`, or null (missing or unreadable: analysed again). */
export async function readCached(cache: AnalysisCache, key: string): Promise<PlainResults | null> {
  cache.used.add(key);
  try {
    const plain = deserializeOwned(await readFile(entryPath(cache, key))) as PlainResults;
    cache.hits++;
    const now = new Date();
    await utimes(entryPath(cache, key), now, now).catch(() => undefined);
    return plain;
  } catch {
    return null;
  }
}

/** Stores `plain` under `key` (atomically; a failure to write costs only the next build's time). */
export async function writeCached(cache: AnalysisCache, key: string, plain: PlainResults): Promise<void> {
  cache.used.add(key);
  const target = entryPath(cache, key);
  const temporary = `${target}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
  try {
    await writeFile(temporary, serialize(plain));
    await rename(temporary, target);
  } catch {
    await rm(temporary, { force: true }).catch(() => undefined);
  }
}

/** Removes entries (and leftover temporary files) that no build has used for PRUNE_AFTER_DAYS. */
export async function pruneCache(cache: AnalysisCache, nowMs = Date.now()): Promise<void> {
  const limit = nowMs - PRUNE_AFTER_DAYS * 86_400_000;
  for (const name of await readdir(cache.dir).catch(() => [] as string[])) {
    if (!/\.v8(\..*\.tmp)?$/.test(name) || cache.used.has(name.replace(/\.v8$/, ""))) continue;
    const info = await stat(join(cache.dir, name)).catch(() => null);
    if (info && info.mtimeMs < limit) await rm(join(cache.dir, name), { force: true });
  }
}

/**
 * A memo for the screening stage (assessIntervalMeters) kept in the same folder: each meter's
 * clock scan and anomaly screening under a key of the program, the kind and the inputs' content,
 * so a rebuild whose interval data and weather are unchanged skips them. Synchronous, as the
 * stage is; an entry that cannot be read is computed again, one that cannot be written is not kept.
 */
export function cacheMemo(cache: AnalysisCache): Memo {
  return <T>(kind: string, inputs: unknown, compute: () => T): T => {
    const key = createHash("sha256").update(cache.program).update(kind).update(contentHash(inputs)).digest("hex");
    cache.used.add(key);
    const path = entryPath(cache, key);
    try {
      const value = deserializeOwned(readFileSync(path)) as T;
      const now = new Date();
      try {
        utimesSync(path, now, now);
      } catch {
        // only the entry's age for pruning
      }
      return value;
    } catch {
      // not kept yet, or unreadable
    }
    const value = compute();
    const temporary = `${path}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
    try {
      writeFileSync(temporary, serialize(value));
      renameSync(temporary, path);
    } catch {
      rmSync(temporary, { force: true });
    }
    return value;
  };
}
