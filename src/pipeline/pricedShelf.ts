/**
 * Every bill's re-pricing kept on disk between stages, a building to a file, so the forecast and
 * the site hold a few buildings' priced bills instead of the whole portfolio's. With their lines
 * and notes they are the largest thing the analysis leaves (about 30 MB serialized per 256
 * buildings of the demo's mix, several times that as objects), and after the portfolio-wide
 * tallies only a building's own pages read them line by line.
 *
 * `fill` writes each building's map (in the order of the analysis results) to its own file;
 * the shelf is then a read-only map over all of them, in the order a Map filled building after
 * building would have (a bill id repeated in a later building keeps its first place and takes
 * the later value), and `building(i)` is a read-only map over one building's file. Reads are
 * synchronous (pages ask for a bill inside computations); the buildings read last are kept.
 * Code that iterates every entry reads every file in turn: a sweep, not a second copy.
 */
import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { serialize } from "node:v8";
import type { PricedBill } from "../tariff/index.ts";
import { deserializeOwned } from "../core/deserializeOwned.ts";

/** Buildings read last, newest first: a page pass reads one building's bills many times in a row. */
const KEEP_RECENT = 4;

export class PricedShelf implements ReadonlyMap<string, PricedBill> {
  /** Bill id → the building whose file holds its value, in the merged map's key order. */
  readonly #buildingOf = new Map<string, number>();
  /** Each building's bill ids in its own map's order, and its file. */
  readonly #buildings: { keys: string[]; file: string }[] = [];
  #recent: [number, ReadonlyMap<string, PricedBill>][] = [];

  private constructor() {}

  /**
   * Writes each map of `byBuilding` to its own file in `dir` (an existing folder; the files are
   * named `priced-N.v8`) and returns the shelf that reads them back.
   */
  static fill(dir: string, byBuilding: Iterable<ReadonlyMap<string, PricedBill>>): PricedShelf {
    const shelf = new PricedShelf();
    for (const priced of byBuilding) {
      const index = shelf.#buildings.length;
      const file = join(dir, `priced-${index}.v8`);
      writeFileSync(file, serialize([...priced]));
      shelf.#buildings.push({ keys: [...priced.keys()], file });
      for (const key of priced.keys()) shelf.#buildingOf.set(key, index);
    }
    return shelf;
  }

  /** Building `index`'s own priced bills (the map `fill` was given at that position). */
  building(index: number): ReadonlyMap<string, PricedBill> {
    return new BuildingView(this, index, this.#buildings[index]?.keys ?? []);
  }

  /** Building `index`'s map, read from its file unless read lately. */
  read(index: number): ReadonlyMap<string, PricedBill> {
    const kept = this.#recent.find(([i]) => i === index);
    if (kept) return kept[1];
    const file = this.#buildings[index].file;
    let entries: [string, PricedBill][];
    try {
      entries = deserializeOwned(readFileSync(file)) as [string, PricedBill][];
    } catch (error) {
      throw new Error(`the build's scratch file ${file} could not be read back (${(error as Error).message}); was it removed or changed while the build ran?`, { cause: error });
    }
    const map = new Map(entries);
    this.#recent = [[index, map] as [number, ReadonlyMap<string, PricedBill>], ...this.#recent].slice(0, KEEP_RECENT);
    return map;
  }

  get size(): number {
    return this.#buildingOf.size;
  }

  has(key: string): boolean {
    return this.#buildingOf.has(key);
  }

  get(key: string): PricedBill | undefined {
    const index = this.#buildingOf.get(key);
    return index === undefined ? undefined : this.read(index).get(key);
  }

  keys(): MapIterator<string> {
    return this.#buildingOf.keys();
  }

  entries(): MapIterator<[string, PricedBill]> {
    return lazily(this.#buildingOf.keys(), (key) => [key, this.get(key)!] as [string, PricedBill]);
  }

  values(): MapIterator<PricedBill> {
    return lazily(this.#buildingOf.keys(), (key) => this.get(key)!);
  }

  [Symbol.iterator](): MapIterator<[string, PricedBill]> {
    return this.entries();
  }

  forEach(callback: (value: PricedBill, key: string, map: ReadonlyMap<string, PricedBill>) => void, thisArg?: unknown): void {
    for (const [key, value] of this.entries()) callback.call(thisArg, value, key, this);
  }
}

/** One building's priced bills, read from the shelf when asked for. */
class BuildingView implements ReadonlyMap<string, PricedBill> {
  readonly #keys: ReadonlySet<string>;

  constructor(
    private readonly shelf: PricedShelf,
    private readonly index: number,
    keys: readonly string[],
  ) {
    this.#keys = new Set(keys);
  }

  get size(): number {
    return this.#keys.size;
  }

  has(key: string): boolean {
    return this.#keys.has(key);
  }

  get(key: string): PricedBill | undefined {
    return this.#keys.has(key) ? this.shelf.read(this.index).get(key) : undefined;
  }

  keys(): MapIterator<string> {
    return this.#keys.keys() as MapIterator<string>;
  }

  entries(): MapIterator<[string, PricedBill]> {
    return lazily(this.#keys, (key) => [key, this.get(key)!] as [string, PricedBill]);
  }

  values(): MapIterator<PricedBill> {
    return lazily(this.#keys, (key) => this.get(key)!);
  }

  [Symbol.iterator](): MapIterator<[string, PricedBill]> {
    return this.entries();
  }

  forEach(callback: (value: PricedBill, key: string, map: ReadonlyMap<string, PricedBill>) => void, thisArg?: unknown): void {
    for (const [key, value] of this.entries()) callback.call(thisArg, value, key, this);
  }
}

/** Node 20 has no iterator helpers. */
function lazily<T>(keys: Iterable<string>, read: (key: string) => T): MapIterator<T> {
  return (function* () {
    for (const key of keys) yield read(key);
  })() as unknown as MapIterator<T>;
}
