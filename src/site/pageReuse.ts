/**
 * Incremental page writing: a page whose inputs are unchanged since the last build is copied
 * from the site that build published instead of being rendered again (charts, templates, the
 * client bundle's edits). What a page depends on goes into its key:
 * - the program (code and lock file, from the caller) and every file of the template folder;
 * - the client bundle's tags (hashed asset names);
 * - `site.meta`, the only portfolio-level part a per-building template reads (see writeSite.ts);
 * - the page's own view model, before its charts are rendered, and the sizes of its data files.
 * The manifest (`pages.json` in the cache folder) records each published page's key and the
 * SHA-256 of the file written; a page is reused only when its key matches AND the file now in
 * the published folder still has that hash, so a site changed, replaced or half-deleted by hand
 * is rendered again, never trusted. The reused site is byte-identical to a full render
 * (test/site/pageReuse.test.ts).
 */
import { createHash } from "node:crypto";
import { copyFile, mkdir, readFile, rename, rm, writeFile } from "node:fs/promises";
import { dirname, join } from "node:path";
import { contentHash, hashFolder } from "../core/contentHash.ts";

/** Bump when the manifest's format or the key's recipe changes. */
const FORMAT = "ohmbook-page-cache/1";
const MANIFEST = "pages.json";

interface Manifest {
  format: string;
  /** Site-relative path → the page's key and the SHA-256 of the file published. */
  pages: Record<string, { key: string; sha256: string }>;
}

export interface PageReuse {
  /** The key of a page: its view model (and data-file sizes) under this build's shared inputs. */
  keyOf(page: unknown): string;
  /** Copies `path` from the published site into `stage` when its key and file are unchanged. */
  reuse(path: string, key: string, stage: string): Promise<boolean>;
  /** Records a page rendered into `stage` (its key and the hash of the file written). */
  rendered(path: string, key: string, stage: string): Promise<void>;
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
  try {
    const m = JSON.parse(await readFile(join(cacheDir, MANIFEST), "utf8")) as Manifest;
    if (m.format === FORMAT && m.pages && typeof m.pages === "object") previous = m.pages;
  } catch {
    // no manifest yet, or unreadable: every page is rendered
  }
  const next: Manifest["pages"] = {};
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
      const bytes = await readFile(published).catch(() => null);
      if (bytes === null || sha256(bytes) !== before.sha256) return false;
      await mkdir(dirname(join(stage, path)), { recursive: true });
      await copyFile(published, join(stage, path));
      next[path] = before;
      reused++;
      return true;
    },
    async rendered(path, key, stage) {
      const bytes = await readFile(join(stage, path));
      next[path] = { key, sha256: sha256(bytes) };
      renderedCount++;
    },
    async save() {
      await mkdir(cacheDir, { recursive: true });
      const target = join(cacheDir, MANIFEST);
      const temporary = `${target}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
      try {
        const sorted = Object.fromEntries(Object.entries(next).sort(([a], [b]) => (a < b ? -1 : 1)));
        await writeFile(temporary, JSON.stringify({ format: FORMAT, pages: sorted } satisfies Manifest));
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
