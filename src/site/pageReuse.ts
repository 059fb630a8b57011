/**
 * Incremental page writing: a page whose inputs are unchanged since the last build is copied
 * from the site that build published instead of being rendered again (charts, templates, the
 * client bundle's edits). What a page depends on goes into its key:
 * - the program (code and lock file, from the caller) and every file of the template folder;
 * - the client bundle's tags (hashed asset names);
 * - `site.meta`, the only portfolio-level part a per-building template reads (see writeSite.ts);
 * - the page's own view model, before its charts are rendered, and the sizes of its data files.
 * The manifest (`pages.json` in the cache folder) records each published page's key, the
 * SHA-256 of the file written and the file's size, modification time and inode; a page is reused
 * only when its key matches AND the file now in the published folder still has that hash, so a
 * site changed, replaced or half-deleted by hand is rendered again, never trusted. A file whose
 * size, modification time (to the nanosecond) and inode are all as recorded is taken to hold
 * the recorded bytes without reading it, as make and rsync do; any difference and it is read and
 * hashed. A reused page is hard-linked into the new site (copied where links are refused), so
 * it keeps its inode and time and the next build again need not read it. The reused site is
 * byte-identical to a full render (test/site/pageReuse.test.ts).
 *
 * A group of pages made from one input (a building's pages from its slice of the report input,
 * src/report/buildingSlice.ts) can also be reused whole, before its view models are made: the
 * manifest records the group's key (the content hash of that input, under the same shared
 * inputs) and its pages; when the key matches and every page of the group still holds its
 * recorded bytes, all are reused, else none is (and each page is then keyed as above).
 */
import { createHash } from "node:crypto";
import { copyFile, link, mkdir, readFile, rename, rm, stat, writeFile } from "node:fs/promises";
import { dirname, join } from "node:path";
import { contentHash, hashFolder } from "../core/contentHash.ts";

/** Bump when the manifest's format or the key's recipe changes. */
const FORMAT = "ohmbook-page-cache/4";
const MANIFEST = "pages.json";

interface Manifest {
  format: string;
  /** Site-relative path → the page's key, the SHA-256 of the file published and its stat. */
  pages: Record<string, PageRecord>;
  /** Group name → the key of the input its pages are made from, and their site-relative paths. */
  groups: Record<string, { key: string; paths: string[] }>;
}

interface PageRecord {
  key: string;
  sha256: string;
  /** The published file's size, modification time in ns and inode (decimal strings). */
  size: string;
  mtimeNs: string;
  ino: string;
}

/** Size, modification time and inode of a file (null when it is missing). */
async function fileStat(path: string): Promise<Pick<PageRecord, "size" | "mtimeNs" | "ino"> | null> {
  const st = await stat(path, { bigint: true }).catch(() => null);
  return st === null || !st.isFile() ? null : { size: String(st.size), mtimeNs: String(st.mtimeNs), ino: String(st.ino) };
}

/** Whether the file at `path` still holds the bytes `record` was made from. */
async function unchangedSince(path: string, record: PageRecord): Promise<boolean> {
  const now = await fileStat(path);
  if (now === null) return false;
  if (now.size === record.size && now.mtimeNs === record.mtimeNs && now.ino === record.ino) return true;
  const bytes = await readFile(path).catch(() => null);
  return bytes !== null && sha256(bytes) === record.sha256;
}

/** Puts the published file at `to`: a hard link (no bytes copied), or a copy where links fail (another file system, no link support). */
async function linkOrCopy(from: string, to: string): Promise<void> {
  try {
    await link(from, to);
  } catch {
    await copyFile(from, to);
  }
}

export interface PageReuse {
  /** The key of a page: its view model (and data-file sizes) under this build's shared inputs. */
  keyOf(page: unknown): string;
  /** Copies `path` from the published site into `stage` when its key and file are unchanged. */
  reuse(path: string, key: string, stage: string): Promise<boolean>;
  /** Records a page rendered into `stage` (its key and the hash of the file written). */
  rendered(path: string, key: string, stage: string): Promise<void>;
  /** The key of a group's input (plain data contentHash reads: objects, arrays, Map, Set, typed arrays; no function) under this build's shared inputs. */
  groupKeyOf(input: unknown): string;
  /** Copies every page of `group` from the published site into `stage` when the group's key and all its files are unchanged; else copies none. */
  reuseGroup(group: string, key: string, stage: string): Promise<boolean>;
  /** Records that `paths` (each already rendered or reused by this build) are the pages of `group`, made from an input of key `key`. */
  madeGroup(group: string, key: string, paths: readonly string[]): void;
  /** Writes the manifest of this build's pages (after the site is published). */
  save(): Promise<void>;
  readonly reused: number;
  readonly renderedCount: number;
}

const sha256 = (bytes: Buffer): string => createHash("sha256").update(bytes).digest("hex");

/**
 * Opens the page cache in `cacheDir` for a build that will publish into `publishedDir`.
 * `program` fingerprints the code; `contentDir` is the template folder; `shared` is every
 * portfolio-level input per-building pages read (site.meta and the bundle's tags).
 */
export async function openPageReuse(options: { cacheDir: string; publishedDir: string; program: string; contentDir: string; shared: unknown }): Promise<PageReuse> {
  const { cacheDir, publishedDir } = options;
  const hash = createHash("sha256").update(FORMAT).update(options.program);
  hashFolder(hash, options.contentDir, /./);
  const base = hash.update(contentHash(options.shared)).digest("hex");
  let previous: Manifest["pages"] = {};
  let previousGroups: Manifest["groups"] = {};
  try {
    const m = JSON.parse(await readFile(join(cacheDir, MANIFEST), "utf8")) as Manifest;
    if (m.format === FORMAT && m.pages && typeof m.pages === "object" && m.groups && typeof m.groups === "object") {
      previous = m.pages;
      previousGroups = m.groups;
    }
  } catch {
    // no manifest yet, or unreadable: every page is rendered
  }
  const next: Manifest["pages"] = {};
  const nextGroups: Manifest["groups"] = {};
  // Folders already made in the new site (most pages share a few).
  const folders = new Set<string>();
  const madeFolder = async (dir: string) => {
    if (folders.has(dir)) return;
    await mkdir(dir, { recursive: true });
    folders.add(dir);
  };
  /**
   * Links (or copies) the published page at `path` into `stage` and returns its stat there, or
   * null after removing it when it cannot be read back: a page must never be rendered over a
   * link, since writing it in place would change the published file too.
   */
  const takePublished = async (path: string, stage: string): Promise<Awaited<ReturnType<typeof fileStat>>> => {
    const target = join(stage, path);
    await madeFolder(dirname(target));
    await linkOrCopy(join(publishedDir, path), target);
    const now = await fileStat(target);
    if (now === null) await rm(target, { force: true });
    return now;
  };
  let reused = 0;
  let renderedCount = 0;
  return {
    // Page models are plain JSON data (no Map, typed array or NaN: test/site/pageReuse.test.ts),
    // so their JSON text is their content, and native JSON is far quicker than walking them.
    keyOf: (page) => createHash("sha256").update(base).update(JSON.stringify(page)).digest("hex"),
    async reuse(path, key, stage) {
      const before = previous[path];
      if (!before || before.key !== key) return false;
      const published = join(publishedDir, path);
      if (!(await unchangedSince(published, before))) return false;
      const now = await takePublished(path, stage);
      if (now === null) return false;
      next[path] = { ...before, ...now };
      reused++;
      return true;
    },
    async rendered(path, key, stage) {
      const target = join(stage, path);
      const bytes = await readFile(target);
      next[path] = { key, sha256: sha256(bytes), ...(await fileStat(target))! };
      renderedCount++;
    },
    // By content (contentHash: numbers by value, keys sorted), not by node:v8's bytes: those
    // depend on how V8 happens to store a value (a number as a small integer or a double),
    // which differs between a value computed and one read back from the analysis cache.
    // A different prefix from page keys: the two never meet.
    groupKeyOf: (input) => createHash("sha256").update(base).update("group\0").update(contentHash(input)).digest("hex"),
    async reuseGroup(group, key, stage) {
      const before = previousGroups[group];
      if (!before || before.key !== key || !Array.isArray(before.paths)) return false;
      const records: [string, PageRecord][] = [];
      for (const path of before.paths) {
        const record = previous[path];
        if (!record || !(await unchangedSince(join(publishedDir, path), record))) return false;
        records.push([path, record]);
      }
      const taken: string[] = [];
      for (const [path, record] of records) {
        const now = await takePublished(path, stage);
        if (now === null) {
          // The group is rendered whole instead: none of its links may stay (see takePublished).
          for (const p of taken) await rm(join(stage, p), { force: true });
          for (const [p] of records) delete next[p];
          return false;
        }
        taken.push(path);
        next[path] = { ...record, ...now };
      }
      nextGroups[group] = { key, paths: [...before.paths] };
      reused += records.length;
      return true;
    },
    madeGroup(group, key, paths) {
      // Only pages this build recorded: a group with a page missing is not kept (made again next time).
      if (paths.every((p) => next[p] !== undefined)) nextGroups[group] = { key, paths: [...paths] };
    },
    async save() {
      await mkdir(cacheDir, { recursive: true });
      const target = join(cacheDir, MANIFEST);
      const temporary = `${target}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
      try {
        const sorted = Object.fromEntries(Object.entries(next).sort(([a], [b]) => (a < b ? -1 : 1)));
        const groups = Object.fromEntries(Object.entries(nextGroups).sort(([a], [b]) => (a < b ? -1 : 1)));
        await writeFile(temporary, JSON.stringify({ format: FORMAT, pages: sorted, groups } satisfies Manifest));
        await rename(temporary, target);
      } catch {
        // a manifest that cannot be written costs only the next build's time
        await rm(temporary, { force: true }).catch(() => undefined);
      }
    },
    get reused() {
      return reused;
    },
    get renderedCount() {
      return renderedCount;
    },
  };
}
