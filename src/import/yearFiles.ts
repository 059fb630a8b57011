/**
 * Staged, merging writes of per-meter-per-year CSV files (`intervals/<meter_id>-<year>.csv`):
 * rows are buffered up to a limit, then merged with the file already in the portfolio (or already
 * staged) and written to a staging folder, sorted by time. A row whose meter and instant are already
 * present with the same value is counted, not added, so re-importing adds nothing; with a different
 * value it is a conflict. Memory is bounded by the buffer and one year file of one meter.
 */
import { existsSync } from "node:fs";
import { mkdir, readFile, rename, writeFile } from "node:fs/promises";
import { dirname, join } from "node:path";

/** One row to store: cells in header order; cells[0] is the meter id, cells[2] the compared value. */
export interface StagedRow {
  epochS: number;
  cells: string[];
  /** Where the row came from, for conflict messages. */
  source: { file: string; line: number };
}

export interface Conflict {
  row: StagedRow;
  path: string;
  existing: string;
}

export class YearFileStore {
  private buffer = new Map<string, StagedRow[]>();
  private buffered = 0;
  private chain: Promise<void> = Promise.resolve();
  private headers = new Map<string, string>();
  readonly staged = new Set<string>();
  readonly added = new Map<string, number>();
  readonly alreadyPresent = new Map<string, number>();
  readonly conflicts: Conflict[] = [];

  /**
   * @param portfolioDir the folder whose files are merged
   * @param stagingDir a scratch folder beside them (same file system, so commit() is a rename)
   * @param flushRows rows buffered before a merge
   */
  constructor(private readonly portfolioDir: string, private readonly stagingDir: string, private readonly flushRows = 100_000) {}

  /** Buffers a row; when the buffer is full, returns the promise of its merge (else null). */
  add(relPath: string, header: string, row: StagedRow): Promise<void> | null {
    this.headers.set(relPath, header);
    let rows = this.buffer.get(relPath);
    if (!rows) this.buffer.set(relPath, (rows = []));
    rows.push(row);
    return ++this.buffered >= this.flushRows ? this.flush() : null;
  }

  /** Merges every buffered row into its staged file; merges run one after another. */
  flush(): Promise<void> {
    const snapshot = this.buffer;
    this.buffer = new Map();
    this.buffered = 0;
    this.chain = this.chain.then(async () => {
      for (const [relPath, rows] of snapshot) await this.merge(relPath, rows);
    });
    return this.chain;
  }

  private async merge(relPath: string, rows: StagedRow[]): Promise<void> {
    const staged = join(this.stagingDir, relPath);
    const original = join(this.portfolioDir, relPath);
    const source = this.staged.has(relPath) ? staged : existsSync(original) ? original : null;
    const header = this.headers.get(relPath)!;
    // key → [sort key, line text, compared value]
    const existing = new Map<string, { epochS: number; text: string; value: string }>();
    let extra = 0;
    if (source) {
      const lines = (await readFile(source, "utf8")).split(/\r?\n/);
      const head = lines[0]!.split(",").map((h) => h.trim().toLowerCase());
      const iMeter = head.indexOf("meter_id");
      const iTs = head.indexOf("timestamp");
      for (let i = 1; i < lines.length; i++) {
        const text = lines[i]!;
        if (text.trim() === "") continue;
        const cells = text.split(",");
        const epochS = Date.parse(cells[iTs] ?? "") / 1000;
        const key = Number.isFinite(epochS) ? `${cells[iMeter]}|${epochS}` : `?${extra++}`;
        existing.set(key, { epochS: Number.isFinite(epochS) ? epochS : -Infinity, text, value: cells[2] ?? "" });
      }
    }
    let changed = false;
    for (const row of rows) {
      const meter = row.cells[0]!;
      const key = `${meter}|${row.epochS}`;
      const have = existing.get(key);
      if (have) {
        if (have.value === row.cells[2] || Number(have.value) === Number(row.cells[2])) this.count(this.alreadyPresent, meter);
        else this.conflicts.push({ row, path: relPath, existing: have.value });
        continue;
      }
      existing.set(key, { epochS: row.epochS, text: row.cells.join(","), value: row.cells[2]! });
      this.count(this.added, meter);
      changed = true;
    }
    if (!changed && !this.staged.has(relPath)) return;
    const sorted = [...existing.values()].sort((a, b) => a.epochS - b.epochS);
    await mkdir(dirname(staged), { recursive: true });
    await writeFile(staged, `${header}\n${sorted.map((r) => r.text).join("\n")}\n`);
    this.staged.add(relPath);
  }

  private count(map: Map<string, number>, meter: string): void {
    map.set(meter, (map.get(meter) ?? 0) + 1);
  }

  /** Moves every staged file into the portfolio folder (one rename per file). */
  async commit(): Promise<string[]> {
    const moved: string[] = [];
    for (const relPath of [...this.staged].sort()) {
      await mkdir(dirname(join(this.portfolioDir, relPath)), { recursive: true });
      await rename(join(this.stagingDir, relPath), join(this.portfolioDir, relPath));
      moved.push(relPath);
    }
    return moved;
  }
}
