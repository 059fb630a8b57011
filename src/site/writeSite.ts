/**
 * Writes the static site: Vite bundles the client scripts and styles once (clientBundle.ts),
 * Eleventy renders the view models through content/ templates, each page given the bundle's
 * tags as it is written, then the data files are added. Built in
 * a scratch folder next to `outDir` and swapped in by rename, so a failed build never leaves
 * a half-written site and a reader never sees one mid-build.
 */
import { mkdir, mkdtemp, readdir, rename, rm, stat, utimes, writeFile } from "node:fs/promises";
import { rmSync } from "node:fs";
import { basename, dirname, join, relative, resolve, sep } from "node:path";
import { fileURLToPath } from "node:url";
import Eleventy from "@11ty/eleventy";
import type { SiteModel, SiteModelInParts } from "../report/index.ts";
import { OhmbookError } from "../core/errors.ts";
import { collectGarbage, garbageBudget } from "../core/collectGarbage.ts";
import { buildingDataSizeIndex, prepareBuildingPages, prepareMeterPages, preparePortfolioPages, prepareTenantPages } from "./prepareSite.ts";
import { applyClientBundle, type ClientBundle } from "./clientBundle.ts";
import { clientBundleOnce, copyFiles } from "./bundleReuse.ts";
import { BundleChildError, buildClientBundleInChild, stopBundleChildren } from "./bundleInChild.ts";
export { viteOptions } from "./viteOptions.ts";
import { openPageReuse, type PageReuse } from "./pageReuse.ts";
import { cacheNunjucksTemplates } from "./nunjucksCache.ts";

/** Project root (where content/ and .eleventy.js live), independent of the process cwd. */
const PROJECT_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "..", "..");
const CONTENT_DIR = join(PROJECT_ROOT, "content");
const ELEVENTY_CONFIG = join(PROJECT_ROOT, ".eleventy.js");

/** Raised when the site cannot be written; the previous site (if any) is left untouched. */
export class SiteWriteError extends OhmbookError {}

export interface WriteSiteOptions {
  /** Let Eleventy and Vite log progress and errors to the console. Default false. */
  verbose?: boolean;
  /** Template folder (layouts, pages, assets); default the project's content/. */
  contentDir?: string;
  /** Building pages per Eleventy pass (default BUILDINGS_PER_PASS); the output does not depend on it. */
  buildingsPerPass?: number;
  /** Called after each pass of building pages with how many buildings' pages are written. */
  onProgress?: (buildingsDone: number, buildingsTotal: number) => void;
  /**
   * Incremental writing (pageReuse.ts, bundleReuse.ts): the client bundle and every building,
   * meter and tenant page and claim sheet whose inputs are unchanged since the last build into `outDir` are
   * copied from it, not made again. `cacheDir` holds the manifests (never inside the site);
   * `program` fingerprints the code.
   */
  reuse?: { cacheDir: string; program: string };
  /** The client bundle started earlier (startClientBundle, same content folder and reuse); default: made here. */
  bundle?: EarlyBundle;
}

/** What a build wrote afresh and what it took unchanged from the previous site. */
export interface WriteSiteStats {
  pagesRendered: number;
  pagesReused: number;
  bundleReused: boolean;
}

/** Prefix of the scratch folders of builds into `outDir`. */
function scratchPrefix(outDir: string): string {
  return `.${basename(outDir)}.ohmbook-build-`;
}

/**
 * Scratch folders untouched for longer than this are leftovers of a killed build. A build keeps
 * its own folders fresh every SCRATCH_HEARTBEAT_MS however long it runs (a build of thousands of
 * buildings takes hours), so a concurrent build never takes a live one for a leftover.
 */
const STALE_SCRATCH_MS = 60 * 60 * 1000;
const SCRATCH_HEARTBEAT_MS = 5 * 60 * 1000;

/** Scratch folders of builds into `outDir` (full paths), in progress or left by killed builds. */
async function scratchFolders(outDir: string): Promise<string[]> {
  const parent = dirname(outDir);
  const prefix = scratchPrefix(outDir);
  try {
    return (await readdir(parent)).filter((n) => n.startsWith(prefix)).map((n) => join(parent, n));
  } catch {
    return [];
  }
}

/**
 * Removes scratch folders a killed build left next to `outDir`, with the Vite plugin's
 * temporary folder inside them. Each build uses its own fresh scratch folder (so a leftover
 * cannot break it, unlike the plugin's default shared `.11ty-vite`); only old ones are removed,
 * so a concurrent build into the same folder keeps its own.
 */
async function removeStaleScratch(outDir: string): Promise<void> {
  const now = Date.now();
  await Promise.all(
    (await scratchFolders(outDir))
      .map(async (path) => {
        const info = await stat(path).catch(() => null);
        if (info && now - info.mtimeMs > STALE_SCRATCH_MS) await rm(path, { recursive: true, force: true });
      }),
  );
}

/** Scratch folders of builds in progress in this process, so a signal handler can remove them. */
const activeScratch = new Set<string>();
let heartbeat: NodeJS.Timeout | null = null;

/**
 * Marks this process's scratch folders as in use (their modification time set to now), so a
 * build started later next to the same output does not remove them as stale. Called every
 * SCRATCH_HEARTBEAT_MS while any exists; a folder that cannot be touched is left as it is.
 */
export async function refreshActiveScratch(now = new Date()): Promise<void> {
  await Promise.all([...activeScratch].map((path) => utimes(path, now, now).catch(() => undefined)));
}

function trackScratch(path: string): void {
  activeScratch.add(path);
  // unref: the timer never keeps a finished process alive
  heartbeat ??= setInterval(() => void refreshActiveScratch(), SCRATCH_HEARTBEAT_MS).unref();
}

function untrackScratch(path: string): void {
  activeScratch.delete(path);
  if (activeScratch.size === 0 && heartbeat) {
    clearInterval(heartbeat);
    heartbeat = null;
  }
}

/**
 * Removes the scratch folders of builds still in progress (synchronously: for a signal handler
 * that is about to exit). The output folder itself is never touched: the swap either happened
 * or not, and a half-done swap is repaired by the next build (see recoverInterruptedSwap).
 */
export function removeActiveScratch(): void {
  stopBundleChildren();
  for (const path of activeScratch) {
    try {
      rmSync(path, { recursive: true, force: true });
    } catch {
      // best effort on the way out
    }
  }
  for (const path of [...activeScratch]) untrackScratch(path);
}

/**
 * A build killed between the two renames of the swap leaves the output folder missing and the
 * previous site in `<scratch>/previous`. Put the newest such site back before anything else.
 */
async function recoverInterruptedSwap(out: string): Promise<void> {
  if (await exists(out)) return;
  let best: { path: string; mtime: number } | null = null;
  for (const folder of await scratchFolders(out)) {
    const previous = join(folder, "previous");
    const info = await stat(previous).catch(() => null);
    if (info?.isDirectory() && (best === null || info.mtimeMs > best.mtime)) best = { path: previous, mtime: info.mtimeMs };
  }
  if (best) await rename(best.path, out);
}

/**
 * Refusals that do not need the analysis: call before any work, so a wrong `--out` costs nothing.
 * @throws SiteWriteError when `outDir` is a file, the current folder or one of its parents, the
 *   ohmbook installation, the portfolio folder (or inside it), or a non-empty folder ohmbook did
 *   not write.
 */
export async function checkOutputFolder(outDir: string, inputDir?: string): Promise<void> {
  const out = resolve(outDir);
  if (inputDir !== undefined) {
    const input = resolve(inputDir);
    if (isInside(out, input) || isInside(input, out)) {
      throw new SiteWriteError(`refusing to write the site to ${outDir}: it is the portfolio folder, inside it, or contains it; choose an output folder of its own, e.g. _site`);
    }
  }
  await recoverInterruptedSwap(out).catch(() => undefined);
  await assertReplaceable(out);
}

/** File every site carries so a later build knows the folder is ours to replace. */
export const SITE_MARKER = ".ohmbook-site";

function isInside(child: string, parent: string): boolean {
  return child === parent || child.startsWith(parent.endsWith(sep) ? parent : parent + sep);
}

/**
 * Refuses to replace a folder that is not a site ohmbook wrote: the swap deletes the old
 * folder, so `--out .` or `--out ~/Documents` must never get that far.
 */
async function assertReplaceable(out: string): Promise<void> {
  if (isInside(process.cwd(), out) || isInside(PROJECT_ROOT, out)) {
    throw new SiteWriteError(`refusing to write the site to ${out}: it contains the current folder or the ohmbook installation; choose an output folder of its own, e.g. _site`);
  }
  let entries: string[];
  try {
    entries = await readdir(out);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return;
    if ((error as NodeJS.ErrnoException).code === "ENOTDIR") {
      throw new SiteWriteError(`refusing to write the site to ${out}: it is a file, not a folder`);
    }
    throw new SiteWriteError(`cannot read the output folder ${out}: ${(error as Error).message}`, { cause: error });
  }
  if (entries.length > 0 && !entries.includes(SITE_MARKER)) {
    throw new SiteWriteError(
      `refusing to replace ${out}: it is not empty and was not written by ohmbook (no ${SITE_MARKER} file); delete it or choose another output folder`,
    );
  }
}

/** Checks a data-file name stays inside data/ (no absolute paths, no `..`). */
function safeDataPath(dataDir: string, name: string): string {
  const target = resolve(dataDir, name);
  if (name === "" || !target.startsWith(dataDir + sep)) {
    throw new SiteWriteError(`data file name "${name}" would be written outside data/`);
  }
  return target;
}

async function exists(path: string): Promise<boolean> {
  try {
    await stat(path);
    return true;
  } catch {
    return false;
  }
}

/**
 * Renders `model` into `outDir` with every file in `dataFiles` (name relative to data/ → text, or
 * such pairs one at a time: each is written and let go before the next is made) under
 * `outDir/data/`. Replaces `outDir` only when the whole build succeeded. A model in parts
 * (siteModelInParts) has its building pages made a pass at a time, so they are never all in memory.
 * `options.verbose` lets Eleventy and Vite log to the console (for debugging a build).
 * @throws SiteWriteError when rendering, bundling or writing fails (outDir unchanged).
 * @example await writeSite(buildSiteModel(input), { "findings.csv": csv }, "_site");
 */
export async function writeSite(
  model: SiteModel | SiteModelInParts,
  dataFiles: Record<string, string> | Iterable<readonly [name: string, text: string]>,
  outDir: string,
  options: WriteSiteOptions = {},
): Promise<WriteSiteStats> {
  const verbose = options.verbose ?? false;
  const contentDir = resolve(options.contentDir ?? CONTENT_DIR);
  const out = resolve(outDir);
  let dataEntries: Iterable<readonly [string, string]> | null = isIterable(dataFiles) ? dataFiles : Object.entries(dataFiles);
  // Refuse bad data-file names before any work (and before touching the disk) when they are known.
  if (!isIterable(dataFiles)) for (const name of Object.keys(dataFiles)) safeDataPath(join(out, "data"), name);
  await checkOutputFolder(out);
  const scratch = await makeScratch(out);
  const stage = join(scratch, "site");
  // The caller's bundle, started earlier, or one started now.
  const early = options.bundle ?? startClientBundle(out, { contentDir, verbose, reuse: options.reuse });
  try {
    // The client bundle first, then the pages beside it.
    const { bundle, reused: bundleReused } = await takeEarlyBundle(early, stage);
    const meta = ("pagesOf" in model ? model.shell : model).meta;
    const pages = options.reuse
      ? await openPageReuse({ cacheDir: options.reuse.cacheDir, publishedDir: out, program: options.reuse.program, contentDir, shared: { meta, headTags: bundle.headTags } })
      : null;
    // The data files first (the pages list them with their sizes), each written as it is made.
    const sizes = await writeDataFiles(dataEntries, join(stage, "data"));
    // What made the files (the forecast's scenarios…) is not kept while the pages are made.
    dataEntries = null;
    dataFiles = {};
    await renderPages(model, sizes, { contentDir, stage, bundle, verbose, buildingsPerPass: options.buildingsPerPass ?? BUILDINGS_PER_PASS, onProgress: options.onProgress, pages });
    if (!(await exists(join(stage, "index.html")))) {
      throw new SiteWriteError("the site build produced no index.html");
    }
    await writeFile(join(stage, SITE_MARKER), "This folder is a static site written by ohmbook; the next build replaces it whole.\n", "utf8");
    // Swap: move the old site aside, the new one in, then delete the old one.
    const previous = join(scratch, "previous");
    const hadPrevious = await exists(out);
    if (hadPrevious) await rename(out, previous);
    try {
      await rename(stage, out);
    } catch (error) {
      if (hadPrevious) await rename(previous, out);
      throw error;
    }
    // Only now do the recorded files match what is published.
    await pages?.save();
    return { pagesRendered: pages?.renderedCount ?? 0, pagesReused: pages?.reused ?? 0, bundleReused };
  } catch (error) {
    if (error instanceof SiteWriteError) throw error;
    if (error instanceof DataFileMakerError) throw error.original;
    const cause = error as Error;
    const stageName = error instanceof BundleChildError ? "bundling scripts and styles (Vite)" : "rendering pages";
    // Vite colours its messages for terminals; the CLI prints this text as is.
    const message = cause.message.replace(/\u001b\[[0-9;]*m/g, "");
    throw new SiteWriteError(`could not write the site to ${outDir} while ${stageName}: ${message}`, { cause });
  } finally {
    if (options.bundle === undefined) await early.dispose();
    await removeScratchFolder(scratch);
  }
}

/**
 * A fresh scratch folder next to `out` (after removing old ones killed builds left), registered
 * so a signal handler can remove it.
 * @throws SiteWriteError when the parent folder cannot be written.
 */
async function makeScratch(out: string): Promise<string> {
  let scratch: string;
  try {
    await mkdir(dirname(out), { recursive: true });
    await removeStaleScratch(out);
    scratch = await mkdtemp(join(dirname(out), scratchPrefix(out)));
  } catch (error) {
    // read-only, full or missing parent folder: a user problem, named with its path and cause
    throw new SiteWriteError(`cannot write next to ${out} (${(error as NodeJS.ErrnoException).code ?? "error"}): ${(error as Error).message}; check that the folder exists, is writable and has free space`, { cause: error });
  }
  trackScratch(scratch);
  return scratch;
}

/**
 * A scratch folder of the build's own next to `outDir` (for files the build keeps out of memory
 * between stages), removed on a signal like the site's and, if a killed build left it, by a later
 * build. Remove it with removeScratchFolder when the build ends.
 * @throws SiteWriteError when the parent folder cannot be written.
 */
export function makeScratchFolder(outDir: string): Promise<string> {
  return makeScratch(resolve(outDir));
}

/** Removes a scratch folder made by makeScratchFolder (or by this module) and forgets it. */
export async function removeScratchFolder(path: string): Promise<void> {
  await rm(path, { recursive: true, force: true });
  untrackScratch(path);
}

/** The client bundle being made ahead of the site (startClientBundle). */
export interface EarlyBundle {
  readonly made: Promise<{ bundle: ClientBundle; reused: boolean; dir: string }>;
  /** Stops the bundler if it still runs and removes its folder (call when the build ends, however it ends). */
  dispose(): Promise<void>;
}

/**
 * Starts making the client bundle for a site to be written to `outDir`, in a child process and
 * a scratch folder of its own next to `outDir`, so it runs while the build analyses and its
 * memory is not the build's. Pass the result to writeSite (`options.bundle`) and dispose of it
 * when the build ends. `contentDir`, `verbose` and `reuse` as for writeSite.
 */
export function startClientBundle(outDir: string, options: Pick<WriteSiteOptions, "contentDir" | "verbose" | "reuse"> = {}): EarlyBundle {
  const out = resolve(outDir);
  const contentDir = resolve(options.contentDir ?? CONTENT_DIR);
  const abort = new AbortController();
  let scratch: string | null = null;
  const made = (async () => {
    const work = (scratch = await makeScratch(out));
    const dir = join(work, "site");
    const result = await clientBundleOnce(contentDir, dir, () => buildClientBundleInChild(contentDir, dir, work, options.verbose ?? false, abort.signal), options.reuse);
    return { ...result, dir };
  })();
  // writeSite awaits it; a build that stops before then has no use for its error.
  made.catch(() => undefined);
  return {
    made,
    async dispose() {
      abort.abort();
      await made.catch(() => undefined);
      if (scratch !== null) await removeScratchFolder(scratch);
    },
  };
}

/** The bundle's files (made in its own scratch folder, or kept in the cache) copied into `stage`. */
async function takeEarlyBundle(early: EarlyBundle, stage: string): Promise<{ bundle: ClientBundle; reused: boolean }> {
  const { bundle, reused, dir } = await early.made;
  await copyFiles(bundle.files, dir, stage);
  return { bundle, reused };
}

/** Carries an error thrown while a data file was being made, so it reaches the caller unchanged. */
class DataFileMakerError extends Error {
  constructor(readonly original: unknown) {
    super("a data file could not be made");
  }
}

function isIterable(value: object): value is Iterable<readonly [string, string]> {
  return typeof (value as { [Symbol.iterator]?: unknown })[Symbol.iterator] === "function";
}

/** Writes each data file under `dataDir` as it comes; returns their sizes in bytes (name → size). */
async function writeDataFiles(entries: Iterable<readonly [string, string]>, dataDir: string): Promise<Record<string, number>> {
  const sizes: Record<string, number> = {};
  // Making the files leaves about ten times their size in garbage (measured: ~1 GB at 1,000 buildings).
  const budget = garbageBudget();
  const iterator = entries[Symbol.iterator]();
  for (;;) {
    let next: IteratorResult<readonly [string, string]>;
    try {
      next = iterator.next();
    } catch (error) {
      // Making a file failed: the maker's error, not a writing problem.
      throw new DataFileMakerError(error);
    }
    if (next.done) break;
    const [name, text] = next.value;
    const target = safeDataPath(dataDir, name);
    await mkdir(dirname(target), { recursive: true });
    await writeFile(target, text, "utf8");
    sizes[name] = Buffer.byteLength(text, "utf8");
    budget.check();
  }
  return sizes;
}

/** Building pages rendered per Eleventy pass (with their meter and tenant pages, in proportion). */
export const BUILDINGS_PER_PASS = 20;

interface RenderContext {
  contentDir: string;
  stage: string;
  bundle: ClientBundle;
  verbose: boolean;
  buildingsPerPass: number;
  onProgress?: (done: number, total: number) => void;
  /** Unchanged pages copied from the previous site (null: every page rendered). */
  pages: PageReuse | null;
}

/**
 * Renders every page of `model` into `ctx.stage`, a few buildings at a time, so memory does not
 * grow with the number of buildings: a first Eleventy pass writes the portfolio-level pages
 * (index, disputes, methods, data…) with the per-building lists empty; then each pass
 * writes a slice of the building, meter and tenant pages and a share of the claim sheets, with their charts rendered just before
 * and dropped after, and the templates of the first pass left out. Paginated templates over
 * `site.buildings`, `site.meterBills` and `site.tenants` must therefore read only their own item
 * and the portfolio-level parts of `site` (as every template does); the site is byte-identical
 * to one rendered in a single pass (test/site/writeSite.test.ts).
 */
async function renderPages(model: SiteModel | SiteModelInParts, sizes: Record<string, number>, ctx: RenderContext): Promise<void> {
  const parts = "pagesOf" in model ? model : null;
  const full = "pagesOf" in model ? null : model;
  const base = parts ? parts.shell : full!;
  // A whole model may have tenant pages and no building pages (the tenant site): count both.
  const buildingCount = parts ? parts.buildingCount : Math.max(full!.buildings.length, full!.tenants.length);
  const portfolioPages = await preparePortfolioPages(base, sizes);
  const ownSizes = buildingDataSizeIndex(sizes);
  // Claim sheets, one per dispute, are reused like the building pages when unchanged, and made
  // in shares alongside the building passes (there are about as many as buildings).
  const claims = await keepFresh(ctx, portfolioPages.claims, (page) => page);
  const passes = Math.ceil(buildingCount / Math.max(1, ctx.buildingsPerPass));
  const firstPassClaims = passes === 0 ? claims : [];
  const shell: SiteModel = { ...portfolioPages, claims: firstPassClaims.map((f) => f.page), buildings: [], meterBills: [], tenants: [] };
  const firstPassTemplates = new Set<string>();
  collectGarbage();
  await eleventyPass(shell, ctx, firstPassTemplates, null);
  if (ctx.pages) for (const f of firstPassClaims) await ctx.pages.rendered(f.page.path, f.key, ctx.stage);
  collectGarbage();
  if (passes === 0) return;
  // A whole model is cut into equal shares of each page list; a model in parts gives the pages
  // of each consecutive range of buildings, made just now.
  const size = Math.ceil(buildingCount / passes);
  const share = <T>(items: readonly T[], i: number) => items.slice(i * Math.ceil(items.length / passes), (i + 1) * Math.ceil(items.length / passes));
  let written = 0;
  ctx.onProgress?.(0, buildingCount);
  for (let i = 0; i < passes; i++) {
    const from = i * size;
    const to = Math.min(buildingCount, from + size);
    // A building whose slice (everything its pages are made from) and data files are unchanged
    // has its pages copied whole, without making their view models; the others are made.
    const groups = parts && ctx.pages ? await freshBuildings(parts, from, to, ownSizes, ctx) : null;
    const all = groups
      ? joinPages(groups.map((g) => g.pages))
      : parts ? parts.pagesOf(from, to) : { buildings: share(full!.buildings, i), meterBills: share(full!.meterBills, i), tenants: share(full!.tenants, i) };
    // Pages unchanged since the last build are copied from it; only the others are made.
    const fresh = <T extends { path: string }>(list: readonly T[], keyInput: (page: T) => unknown) => keepFresh(ctx, list, keyInput);
    const buildings = await fresh(all.buildings, (page) => ({ page, sizes: ownSizes(page.buildingId) }));
    const meterBills = await fresh(all.meterBills, (page) => page);
    const tenants = await fresh(all.tenants, (page) => page);
    const passClaims = share(claims, i);
    if (buildings.length + meterBills.length + tenants.length + passClaims.length > 0) {
      const site: SiteModel = {
        ...shell,
        claims: passClaims.map((f) => f.page),
        buildings: await prepareBuildingPages(buildings.map((f) => f.page), ownSizes),
        meterBills: await prepareMeterPages(meterBills.map((f) => f.page)),
        tenants: await prepareTenantPages(tenants.map((f) => f.page)),
      };
      await eleventyPass(site, ctx, null, firstPassTemplates);
      if (ctx.pages) for (const f of [...buildings, ...meterBills, ...tenants, ...passClaims]) await ctx.pages.rendered(f.page.path, f.key, ctx.stage);
      // Each pass leaves its page strings behind; without this the heap grows with the passes.
      collectGarbage();
    }
    for (const g of groups ?? []) ctx.pages!.madeGroup(g.group, g.key, pagePaths(g.pages));
    written += to - from;
    ctx.onProgress?.(written, buildingCount);
  }
}

type BuildingPages = ReturnType<SiteModelInParts["pagesOfSlice"]>;

/** The page manifest's group of a building's pages. */
const buildingGroup = (buildingId: string) => `building:${buildingId}`;

/**
 * Buildings `from` to `to` whose pages must be made, each with its pages, group and group key
 * (its slice and the sizes of its data files, which its page lists); the pages of the others
 * were copied whole from the previous site.
 */
async function freshBuildings(parts: SiteModelInParts, from: number, to: number, ownSizes: (buildingId: string) => Record<string, number>, ctx: RenderContext): Promise<{ group: string; key: string; pages: BuildingPages }[]> {
  const out: { group: string; key: string; pages: BuildingPages }[] = [];
  for (let j = from; j < to; j++) {
    const slice = parts.sliceOf(j);
    const id = slice.building.buildingId;
    const key = ctx.pages!.groupKeyOf({ slice, sizes: ownSizes(id) });
    if (await ctx.pages!.reuseGroup(buildingGroup(id), key, ctx.stage)) continue;
    out.push({ group: buildingGroup(id), key, pages: parts.pagesOfSlice(slice) });
  }
  return out;
}

function joinPages(list: readonly BuildingPages[]): BuildingPages {
  return { buildings: list.flatMap((p) => p.buildings), meterBills: list.flatMap((p) => p.meterBills), tenants: list.flatMap((p) => p.tenants) };
}

function pagePaths(pages: BuildingPages): string[] {
  return [...pages.buildings, ...pages.meterBills, ...pages.tenants].map((p) => p.path);
}

/**
 * The pages of `list` that must be made (with their reuse keys): the others were copied from
 * the previous site. Without page reuse every page is made.
 */
async function keepFresh<T extends { path: string }>(ctx: RenderContext, list: readonly T[], keyInput: (page: T) => unknown): Promise<{ page: T; key: string }[]> {
  const out: { page: T; key: string }[] = [];
  for (const page of list) {
    const key = ctx.pages ? ctx.pages.keyOf(keyInput(page)) : "";
    if (ctx.pages && (await ctx.pages.reuse(page.path, key, ctx.stage))) continue;
    out.push({ page, key });
  }
  return out;
}

/**
 * One Eleventy run over the templates with `site` as global data, each HTML page given the
 * client bundle's tags as it is written. `record` collects the templates that wrote a page;
 * templates in `skip` are not rendered.
 */
async function eleventyPass(site: SiteModel, ctx: RenderContext, record: Set<string> | null, skip: ReadonlySet<string> | null): Promise<void> {
  const { stage, bundle } = ctx;
  const eleventy = new Eleventy(ctx.contentDir, stage, {
    quietMode: !ctx.verbose,
    configPath: ELEVENTY_CONFIG,
    config(eleventyConfig) {
      eleventyConfig.addGlobalData("site", site);
      cacheNunjucksTemplates(eleventyConfig);
      // Eleventy warns about slow configuration code (our transform) even in quiet mode.
      const bench = eleventyConfig.benchmarkManager as { get?(name: string): { setIsVerbose?(verbose: boolean): void } } | undefined;
      if (!ctx.verbose) bench?.get?.("Configuration")?.setIsVerbose?.(false);
      for (const inputPath of skip ?? []) eleventyConfig.ignores.add(inputPath);
      eleventyConfig.addTransform("ohmbook-client-bundle", function (this: { page?: { outputPath?: unknown; inputPath?: unknown } }, content: string) {
        const outputPath = this.page?.outputPath;
        if (typeof this.page?.inputPath === "string") record?.add(this.page.inputPath);
        if (typeof outputPath !== "string" || !outputPath.endsWith(".html")) return content;
        return applyClientBundle(content, relative(stage, outputPath).split(sep).join("/"), bundle);
      });
    },
  });
  // Library code does not print: errors reach the caller as SiteWriteError instead.
  if (!ctx.verbose) eleventy.disableLogger();
  await eleventy.write();
}
