/**
 * Interval readings kept on disk between stages, so the build holds one building's readings at a
 * time instead of the whole portfolio's (at 1,000 buildings with the demo's mix, ~270 MB that
 * otherwise stayed resident from screening to the last page).
 *
 * After screening, each meter's series is written to its own file in a scratch folder; `get`
 * reads it back whole. Stages ask for a meter inside computations, so reads are synchronous.
 * The few series read last are kept, since callers often ask for the same meter twice in a row
 * (a building task checks a meter's history, then takes it).
 *
 * It is a read-only map: code that iterates every entry reads every file, which is what it
 * would have held in memory anyway.
 *
 * Each series is hashed once, when shelved (unless the build takes no cache key), and every
 * series read back carries that hash as its content digest (core/contentHash.ts
 * withContentDigest): the cache keys that hold a meter's readings (its building's analysis, its
 * forecasts, its building's pages) hash 64 bytes instead of a year of readings each time.
 */
import { closeSync, openSync, readSync, rmSync, writeSync } from "node:fs";
import { join } from "node:path";
import type { IntervalSeries } from "../domain/types.ts";
import { OnDemandMap } from "../core/onDemandMap.ts";
import { contentHash, withContentDigest } from "../core/contentHash.ts";

interface Shelved {
  file: string;
  meterId: string;
  intervalMinutes: number;
  length: number;
  /** contentHash of the series as shelved (the series read back has the same content); undefined when not taken. */
  digest: string | undefined;
}

/** Series read last, newest first (small: a meter's readings are ~0.7 MB a year at 15 minutes). */
const KEEP_RECENT = 4;

export class IntervalShelf extends OnDemandMap<IntervalSeries> {
  readonly #index = new Map<string, Shelved>();
  #recent: [string, IntervalSeries][] = [];
  readonly #dir: string;

  private constructor(dir: string) {
    super();
    this.#dir = dir;
  }

  /**
   * Writes every series of `series` into `dir` (an empty folder this shelf then owns) and
   * returns the shelf that reads them back, in the same key order. `digests: false` leaves the
   * series without a content digest (for a build that takes no cache key: nothing would read it).
   */
  static fill(dir: string, series: ReadonlyMap<string, IntervalSeries>, { digests = true }: { digests?: boolean } = {}): IntervalShelf {
    const shelf = new IntervalShelf(dir);
    let n = 0;
    for (const [key, s] of series) {
      const file = join(dir, `${n++}.f64`);
      const fd = openSync(file, "w");
      try {
        writeAll(fd, bytesOf(s.startMs));
        writeAll(fd, bytesOf(s.values));
      } finally {
        closeSync(fd);
      }
      const digest = digests ? contentHash({ meterId: s.meterId, intervalMinutes: s.intervalMinutes, startMs: s.startMs, values: s.values } satisfies IntervalSeries) : undefined;
      shelf.#index.set(key, { file, meterId: s.meterId, intervalMinutes: s.intervalMinutes, length: s.startMs.length, digest });
    }
    return shelf;
  }

  get size(): number {
    return this.#index.size;
  }

  has(key: string): boolean {
    return this.#index.has(key);
  }

  get(key: string): IntervalSeries | undefined {
    const kept = this.#recent.find(([k]) => k === key);
    if (kept) return kept[1];
    const entry = this.#index.get(key);
    if (!entry) return undefined;
    const series = readSeries(entry);
    this.#recent = [[key, series] as [string, IntervalSeries], ...this.#recent].slice(0, KEEP_RECENT);
    return series;
  }

  /** The content digest of `key`'s series (the one `get` gives it), without reading it; undefined for no such key. */
  digestOf(key: string): string | undefined {
    return this.#index.get(key)?.digest;
  }

  keys(): MapIterator<string> {
    return this.#index.keys();
  }

  /** Removes the files (the shelf is empty afterwards). */
  dispose(): void {
    this.#index.clear();
    this.#recent = [];
    rmSync(this.#dir, { recursive: true, force: true });
  }
}

function bytesOf(a: Float64Array): Uint8Array {
  return new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
}

function writeAll(fd: number, bytes: Uint8Array): void {
  for (let at = 0; at < bytes.byteLength; ) at += writeSync(fd, bytes, at, bytes.byteLength - at);
}

/**
 * Each array in a buffer of its own (caches elsewhere key on a series' buffers), the series with
 * its digest (see the module comment; nothing changes a series read back).
 */
function readSeries(entry: Shelved): IntervalSeries {
  const startMs = new Float64Array(entry.length);
  const values = new Float64Array(entry.length);
  const fd = openSync(entry.file, "r");
  try {
    readAll(fd, bytesOf(startMs), 0, entry.file);
    readAll(fd, bytesOf(values), startMs.byteLength, entry.file);
  } finally {
    closeSync(fd);
  }
  const series: IntervalSeries = { meterId: entry.meterId, intervalMinutes: entry.intervalMinutes, startMs, values };
  return entry.digest === undefined ? series : withContentDigest(series, entry.digest);
}

function readAll(fd: number, bytes: Uint8Array, position: number, file: string): void {
  for (let at = 0; at < bytes.byteLength; ) {
    const got = readSync(fd, bytes, at, bytes.byteLength - at, position + at);
    if (got === 0) throw new Error(`the build's scratch file ${file} is shorter than written; was it removed or truncated while the build ran?`);
    at += got;
  }
}
