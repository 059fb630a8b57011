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
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { mkdir, readdir, readFile, rename, rm, stat, utimes, writeFile } from "node:fs/promises";
import { basename, dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { deserialize, serialize } from "node:v8";
import type { BuildingTask, PlainResults } from "./buildingTask.ts";

/** Bump when the entry format or the key's recipe changes. */
const FORMAT = "ohmbook-analysis-cache/1";
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

/** Every file under `dir` (relative path and contents), sorted, into `hash`. */
function hashTree(hash: ReturnType<typeof createHash>, dir: string, prefix = ""): void {
  for (const entry of readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : 1))) {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) hashTree(hash, path, `${prefix}${entry.name}/`);
    else if (/\.(ts|mts|js|mjs|json)$/.test(entry.name)) {
      hash.update(`${prefix}${entry.name}\0`);
      hash.update(readFileSync(path));
      hash.update("\0");
    }
  }
}

/** The program's fingerprint: the code this module runs from (src/ or dist/cli) and the lock file. */
export function programFingerprint(): string {
  const here = fileURLToPath(import.meta.url);
  const root = resolve(dirname(here), "..", "..");
  const hash = createHash("sha256").update(FORMAT);
  hashTree(hash, here.endsWith(".ts") ? join(root, "src") : dirname(here));
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

/**
 * SHA-256 of a value's content: numbers by their 64-bit pattern, strings, arrays, Map and Set in
 * order, typed arrays byte for byte, objects by sorted keys (functions skipped). Unlike
 * node:v8's serializer, it does not depend on how V8 happens to store a number (small integer
 * or double), which changes as code runs over an object.
 */
export function contentHash(value: unknown): string {
  const hash = createHash("sha256");
  const number = Buffer.alloc(8);
  const walk = (v: unknown): void => {
    if (v === null) hash.update("n");
    else if (v === undefined) hash.update("u");
    else if (typeof v === "boolean") hash.update(v ? "T" : "F");
    else if (typeof v === "number") {
      number.writeDoubleLE(Number.isNaN(v) ? Number.NaN : v);
      hash.update("d").update(number);
    } else if (typeof v === "string") hash.update(`s${v.length}:`).update(v);
    else if (typeof v === "bigint") hash.update(`b${v.toString()};`);
    else if (typeof v === "function" || typeof v === "symbol") return;
    else if (ArrayBuffer.isView(v)) hash.update(`a${v.constructor.name}${v.byteLength}:`).update(new Uint8Array(v.buffer, v.byteOffset, v.byteLength));
    else if (Array.isArray(v)) {
      hash.update(`[${v.length}`);
      for (const x of v) walk(x);
      hash.update("]");
    } else if (v instanceof Map) {
      hash.update(`M${v.size}`);
      for (const [k, x] of v) {
        walk(k);
        walk(x);
      }
    } else if (v instanceof Set) {
      hash.update(`S${v.size}`);
      for (const x of v) walk(x);
    } else if (v instanceof Date) hash.update(`D${v.getTime()};`);
    else {
      const keys = Object.keys(v as object).filter((k) => typeof (v as Record<string, unknown>)[k] !== "function").sort();
      hash.update(`{${keys.length}`);
      for (const k of keys) {
        hash.update(`k${k.length}:${k}`);
        walk((v as Record<string, unknown>)[k]);
      }
      hash.update("}");
    }
  };
  walk(value);
  return hash.digest("hex");
}

/** The key of a building's analysis: program and task. */
export function cacheKey(cache: AnalysisCache, task: BuildingTask): string {
  const own = { ...task, onBug: null, portfolio: { ...task.portfolio, tariffs: null } };
  return createHash("sha256").update(cache.program).update(cache.tariffs).update(contentHash(own)).digest("hex");
}

function entryPath(cache: AnalysisCache, key: string): string {
  return join(cache.dir, `${key}.v8`);
}

/** The cached results of `key`, or null (missing or unreadable: analysed again). */
export async function readCached(cache: AnalysisCache, key: string): Promise<PlainResults | null> {
  cache.used.add(key);
  try {
    const plain = deserialize(await readFile(entryPath(cache, key))) as PlainResults;
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
