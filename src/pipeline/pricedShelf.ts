/**
 * Every bill's re-pricing kept on disk between stages, a building to a file, so the forecast and
 * the site hold a few buildings' priced bills instead of the whole portfolio's. With their lines
 * and notes they are the largest thing the analysis leaves (about 30 MB serialized per 256
 * buildings of the demo's mix, several times that as objects), and after the portfolio-wide
 * tallies only a building's own pages read them line by line.
 *
 * `fill` writes each building's map (in the order of the analysis results) to its own file, a
 * bill to a record; the shelf is then a read-only map over all of them, in the order a Map
 * filled building after building would have (a bill id repeated in a later building keeps its
 * first place and takes the later value), and `building(i)` is a read-only map over one
 * building's file. Reads are synchronous (pages ask for a bill inside computations). Two ways
 * of reading are cheap: a building's bills one after another (its pages, a sweep) read its file
 * once and keep it among the last few read; bills of many buildings in any order (the dispute
 * list, in order of amount) read one record each.
 */
import { closeSync, openSync, readFileSync, readSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { serialize } from "node:v8";
import type { PricedBill } from "../tariff/index.ts";
import { deserializeOwned } from "../core/deserializeOwned.ts";
import { contentDigestOf, withContentDigest } from "../core/contentHash.ts";
import { OnDemandMap } from "../core/onDemandMap.ts";

/** Buildings read last, newest first: a page pass reads one building's bills many times in a row. */
const KEEP_RECENT = 4;

/** Where a bill's record is: its building, its bytes in the building's file, and its content digest if it had one. */
interface Record {
  building: number;
  offset: number;
  length: number;
  digest?: string;
}

export class PricedShelf extends OnDemandMap<PricedBill> {
  /** Bill id → its record (for a repeated id, the later building's), in the merged map's key order. */
  readonly #records = new Map<string, Record>();
  /** Each building's bill ids in its own map's order, their records, and its file. */
  readonly #buildings: { keys: string[]; records: Record[]; file: string }[] = [];
  #recent: [number, ReadonlyMap<string, PricedBill>][] = [];
  /** The building of the last bill read alone: a second one in a row reads the whole file. */
  #lastAlone = -1;

  private constructor() {
    super();
  }

  /**
   * Writes each map of `byBuilding` to its own file in `dir` (an existing folder; the files are
   * named `priced-N.v8`) and returns the shelf that reads them back.
   */
  static fill(dir: string, byBuilding: Iterable<ReadonlyMap<string, PricedBill>>): PricedShelf {
    const shelf = new PricedShelf();
    for (const priced of byBuilding) {
      const building = shelf.#buildings.length;
      const file = join(dir, `priced-${building}.v8`);
      const parts: Buffer[] = [];
      const records: Record[] = [];
      let offset = 0;
      for (const value of priced.values()) {
        const bytes = serialize(value);
        records.push({ building, offset, length: bytes.length, digest: contentDigestOf(value) });
        parts.push(bytes);
        offset += bytes.length;
      }
      writeFileSync(file, Buffer.concat(parts, offset));
      const keys = [...priced.keys()];
      shelf.#buildings.push({ keys, records, file });
      keys.forEach((key, i) => shelf.#records.set(key, records[i]!));
    }
    return shelf;
  }

  /** Building `index`'s own priced bills (the map `fill` was given at that position). */
  building(index: number): ReadonlyMap<string, PricedBill> {
    const b = this.#buildings[index];
    return new BuildingView(this, index, b?.keys ?? []);
  }

  /** Building `index`'s map, read from its file unless read lately. */
  read(index: number): ReadonlyMap<string, PricedBill> {
    const kept = this.#recent.find(([i]) => i === index);
    if (kept) return kept[1];
    const { keys, records, file } = this.#buildings[index]!;
    const bytes = fromScratch(file, () => readFileSync(file));
    const map = new Map<string, PricedBill>();
    keys.forEach((key, i) => map.set(key, decode(bytes, records[i]!, file)));
    this.#recent = [[index, map] as [number, ReadonlyMap<string, PricedBill>], ...this.#recent].slice(0, KEEP_RECENT);
    return map;
  }

  get size(): number {
    return this.#records.size;
  }

  has(key: string): boolean {
    return this.#records.has(key);
  }

  get(key: string): PricedBill | undefined {
    const record = this.#records.get(key);
    if (record === undefined) return undefined;
    const kept = this.#recent.find(([i]) => i === record.building);
    if (kept) return kept[1].get(key);
    if (this.#lastAlone === record.building) return this.read(record.building).get(key);
    this.#lastAlone = record.building;
    return this.#readAlone(record);
  }

  /** One bill's record, without reading the rest of its building's file. */
  #readAlone(record: Record): PricedBill {
    const file = this.#buildings[record.building]!.file;
    const bytes = fromScratch(file, () => {
      const buffer = Buffer.allocUnsafe(record.length);
      const fd = openSync(file, "r");
      try {
        for (let at = 0; at < record.length; ) {
          const got = readSync(fd, buffer, at, record.length - at, record.offset + at);
          if (got === 0) throw new Error("the file is shorter than written");
          at += got;
        }
      } finally {
        closeSync(fd);
      }
      return buffer;
    });
    return decode(bytes, { ...record, offset: 0 }, file);
  }

  keys(): MapIterator<string> {
    return this.#records.keys();
  }

  /** A sweep reads whole buildings (its keys come building after building). */
  protected override valueInOrder(key: string): PricedBill {
    return this.read(this.#records.get(key)!.building).get(key)!;
  }
}

/** What `read` makes of a scratch file, naming the file if it is missing or damaged. */
function fromScratch<T>(file: string, read: () => T): T {
  try {
    return read();
  } catch (error) {
    throw new Error(`the build's scratch file ${file} could not be read back (${(error as Error).message}); was it removed or changed while the build ran?`, { cause: error });
  }
}

function decode(bytes: Buffer, record: Record, file: string): PricedBill {
  if (record.offset + record.length > bytes.length) throw new Error(`the build's scratch file ${file} is shorter than written; was it removed or truncated while the build ran?`);
  const value = fromScratch(file, () => deserializeOwned(bytes.subarray(record.offset, record.offset + record.length)) as PricedBill);
  // The analysis named the bill's pricing by a digest (digestAnalysis): the copy read back keeps it.
  return record.digest === undefined ? value : withContentDigest(value, record.digest);
}

/** One building's priced bills, read from the shelf when asked for. */
class BuildingView extends OnDemandMap<PricedBill> {
  readonly #keys: ReadonlySet<string>;

  constructor(
    private readonly shelf: PricedShelf,
    private readonly index: number,
    keys: readonly string[],
  ) {
    super();
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
}
