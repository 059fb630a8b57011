/**
 * `ohmbook serve [DIR]`: builds the site, serves it on 127.0.0.1, watches the portfolio
 * folder (chokidar) and rebuilds when an input file changes. Each rebuild prints which files
 * changed, the findings that are new or gone since the previous build, and any input problem as
 * `file:line:column: message`; a failed rebuild leaves the previous site served.
 *
 * A rebuild is the full build (`buildPortfolioSite`), which writes into a scratch folder and
 * swaps it in by rename, so a request never sees a half-written site. Changes are debounced, and
 * builds never overlap: changes that arrive during a build are gathered into one more build.
 */
import { createServer, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import { rmSync } from "node:fs";
import { mkdtemp, open, readFile, rm, stat } from "node:fs/promises";
import { tmpdir } from "node:os";
import { extname, join, relative, resolve, sep } from "node:path";
import { watch, type FSWatcher } from "chokidar";
import { InputError, OhmbookError, UsageError } from "../core/errors.ts";
import { formatIssueIn, type InputIssue } from "../core/issues.ts";
import type { FindingJson } from "../audit/index.ts";

// ---------------------------------------------------------------------------------------------
// Findings diff (pure)

/** One row of OUT/data/findings.json (the contract's columns; what the audit writes). */
export type FindingRow = Pick<FindingJson, "building_id" | "meter_id" | "bill_id" | "period_start" | "period_end" | "check" | "severity" | "amount_at_stake" | "message">;

/**
 * What makes a finding the same finding across builds: its check code and what it is about
 * (building, meter, bill, period). Severity, amount and wording may change with the inputs;
 * such a finding is the same one, changed, and is neither new nor gone.
 */
export function findingKey(f: FindingRow): string {
  return [f.check, f.building_id, f.meter_id, f.bill_id ?? "", f.period_start ?? "", f.period_end ?? ""].join("\u0000");
}

export interface FindingsDiff {
  added: FindingRow[];
  gone: FindingRow[];
  /** Same key in both builds, but another severity or amount at stake: [before, after]. */
  changed: [FindingRow, FindingRow][];
}

/** Findings of `next` not in `previous` (added), of `previous` not in `next` (gone), and changed ones; order of the inputs kept. */
export function diffFindings(previous: readonly FindingRow[], next: readonly FindingRow[]): FindingsDiff {
  const before = new Map(previous.map((f) => [findingKey(f), f]));
  const after = new Map(next.map((f) => [findingKey(f), f]));
  const added = next.filter((f) => !before.has(findingKey(f)));
  const gone = previous.filter((f) => !after.has(findingKey(f)));
  const changed: [FindingRow, FindingRow][] = [];
  for (const f of next) {
    const old = before.get(findingKey(f));
    if (old && (old.severity !== f.severity || old.amount_at_stake !== f.amount_at_stake)) changed.push([old, f]);
  }
  return { added, gone, changed };
}

/** One terminal line for a finding: `+ warning usage-outlier bill B-7 (meter M-1, 2024-03-04..2024-04-03): message`. */
export function formatFinding(sign: "+" | "-" | "~", f: FindingRow): string {
  const period = f.period_start && f.period_end ? `, ${f.period_start}..${f.period_end}` : "";
  const subject = f.bill_id ? `bill ${f.bill_id} (meter ${f.meter_id}${period})` : `meter ${f.meter_id}${period ? ` (${period.slice(2)})` : ""}`;
  return `  ${sign} ${f.severity} ${f.check} ${subject}: ${f.message}`;
}

/** The lines a rebuild prints about findings; empty when nothing changed. */
export function describeFindingsDiff(diff: FindingsDiff): string[] {
  const lines: string[] = [];
  if (diff.added.length > 0) lines.push(`${diff.added.length} new finding(s):`, ...diff.added.map((f) => formatFinding("+", f)));
  if (diff.gone.length > 0) lines.push(`${diff.gone.length} finding(s) gone:`, ...diff.gone.map((f) => formatFinding("-", f)));
  if (diff.changed.length > 0) {
    lines.push(`${diff.changed.length} finding(s) changed:`);
    for (const [old, now] of diff.changed) {
      const amount = (a: number | null) => (a === null ? "no amount" : a.toFixed(2));
      lines.push(`${formatFinding("~", now)} (was ${old.severity}, ${amount(old.amount_at_stake)}; now ${amount(now.amount_at_stake)})`);
    }
  }
  return lines;
}

// ---------------------------------------------------------------------------------------------
// Rebuild queue: debounced, never overlapping

/**
 * Gathers changed paths and runs `run` with them after `delayMs` of quiet. A build already
 * running is never overlapped: paths that arrive meanwhile wait, and one more build runs after it.
 */
export class RebuildQueue {
  private pending = new Set<string>();
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<void> | null = null;
  private closed = false;
  private idleWaiters: (() => void)[] = [];

  constructor(
    private readonly run: (changed: string[]) => Promise<void>,
    private readonly delayMs: number,
  ) {}

  /** A path changed (relative to the portfolio folder). */
  notify(path: string): void {
    if (this.closed) return;
    this.pending.add(path);
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => {
      this.timer = null;
      this.startIfReady();
    }, this.delayMs);
  }

  /** Starts a build now, with whatever changed so far (possibly nothing: the first build). */
  runNow(): void {
    if (this.closed || this.running) return;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.start();
  }

  private startIfReady(): void {
    if (this.closed || this.running || this.timer || this.pending.size === 0) {
      if (!this.running && !this.timer && this.pending.size === 0) this.wakeIdle();
      return;
    }
    this.start();
  }

  private start(): void {
    const changed = [...this.pending].sort();
    this.pending.clear();
    this.running = this.run(changed)
      .catch(() => undefined)
      .finally(() => {
        this.running = null;
        this.startIfReady();
      });
  }

  private wakeIdle(): void {
    const waiters = this.idleWaiters;
    this.idleWaiters = [];
    for (const w of waiters) w();
  }

  /** Resolves when no build runs and none is waiting. */
  idle(): Promise<void> {
    if (!this.running && !this.timer && this.pending.size === 0) return Promise.resolve();
    if (this.closed) return this.running ?? Promise.resolve();
    return new Promise((r) => this.idleWaiters.push(r));
  }

  /** Stops scheduling; resolves when a running build has ended. */
  async close(): Promise<void> {
    this.closed = true;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.pending.clear();
    await this.running;
    this.wakeIdle();
  }
}

// ---------------------------------------------------------------------------------------------
// Static file server

const CONTENT_TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".mjs": "text/javascript; charset=utf-8",
  ".json": "application/json; charset=utf-8",
  ".csv": "text/csv; charset=utf-8",
  ".svg": "image/svg+xml",
  ".png": "image/png",
  ".ico": "image/x-icon",
  ".txt": "text/plain; charset=utf-8",
  ".woff2": "font/woff2",
  ".webmanifest": "application/manifest+json",
};

/** The file a URL path names inside `root`, or null when it escapes it or is malformed. */
export function resolveRequestPath(root: string, urlPath: string): string | null {
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPath.split("?")[0]!.split("#")[0]!);
  } catch {
    return null;
  }
  if (decoded.includes("\u0000")) return null;
  const target = resolve(root, `.${decoded.startsWith("/") ? decoded : `/${decoded}`}`);
  if (target !== root && !target.startsWith(root.endsWith(sep) ? root : root + sep)) return null;
  return target;
}

async function fileFor(root: string, urlPath: string): Promise<string | null> {
  const target = resolveRequestPath(root, urlPath);
  if (target === null) return null;
  const info = await stat(target).catch(() => null);
  if (info?.isFile()) return target;
  if (info?.isDirectory()) {
    const index = join(target, "index.html");
    if ((await stat(index).catch(() => null))?.isFile()) return index;
  }
  // /buildings/B1 → /buildings/B1.html, as static hosts do.
  if (!info && extname(target) === "") {
    const html = `${target}.html`;
    if ((await stat(html).catch(() => null))?.isFile()) return html;
  }
  return null;
}

function plain(res: ServerResponse, status: number, text: string): void {
  res.writeHead(status, { "content-type": "text/plain; charset=utf-8", "cache-control": "no-store" });
  res.end(`${text}\n`);
}

function handler(root: string, state: { built: boolean }) {
  return (req: IncomingMessage, res: ServerResponse): void => {
    if (req.method !== "GET" && req.method !== "HEAD") {
      res.setHeader("allow", "GET, HEAD");
      plain(res, 405, "only GET and HEAD");
      return;
    }
    if (!state.built) {
      plain(res, 503, "ohmbook serve: no site yet: the build failed or is still running; see the terminal. Save a fixed input file and reload.");
      return;
    }
    void sendFile(root, req, res).catch(() => {
      if (!res.headersSent) plain(res, 500, "could not read the file");
      else res.destroy();
    });
  };
}

/**
 * Sends the file a request names. The file is opened before anything is sent, so a rebuild's
 * swap (two renames) never cuts a response short: an open file stays readable, and a file
 * caught between the renames is looked up once more a moment later.
 */
async function sendFile(root: string, req: IncomingMessage, res: ServerResponse): Promise<void> {
  for (let attempt = 0; attempt < 3; attempt++) {
    const file = await fileFor(root, req.url ?? "/");
    const handle = file === null ? null : await open(file, "r").catch(() => null);
    if (file === null || handle === null) {
      await new Promise((r) => setTimeout(r, 100));
      continue;
    }
    // Never cached: a reload after a rebuild must show the new pages.
    res.writeHead(200, { "content-type": CONTENT_TYPES[extname(file).toLowerCase()] ?? "application/octet-stream", "cache-control": "no-store" });
    if (req.method === "HEAD") {
      await handle.close();
      res.end();
      return;
    }
    const stream = handle.createReadStream();
    stream.on("error", () => res.destroy());
    stream.pipe(res);
    return;
  }
  plain(res, 404, `not found: ${req.url ?? "/"}`);
}

/** Listens on `host:port`; when `fallback`, tries the next ports while one is taken. */
async function listen(server: Server, host: string, port: number, fallback: boolean): Promise<number> {
  const attempts = fallback && port !== 0 ? 20 : 1;
  for (let i = 0; i < attempts; i++) {
    const tryPort = port + i;
    const outcome = await new Promise<number | NodeJS.ErrnoException>((done) => {
      const onError = (error: NodeJS.ErrnoException) => {
        server.off("listening", onListening);
        done(error);
      };
      const onListening = () => {
        server.off("error", onError);
        const address = server.address();
        done(typeof address === "object" && address !== null ? address.port : tryPort);
      };
      server.once("error", onError);
      server.once("listening", onListening);
      server.listen(tryPort, host);
    });
    if (typeof outcome === "number") return outcome;
    if (outcome.code !== "EADDRINUSE") throw new OhmbookError(`cannot listen on ${host}:${tryPort}: ${outcome.message}`);
  }
  throw new OhmbookError(
    attempts > 1
      ? `ports ${port}–${port + attempts - 1} on ${host} are all in use; choose one with --port N, or --port 0 for any free port`
      : `port ${port} on ${host} is in use; choose another with --port N, or --port 0 for any free port`,
  );
}

// ---------------------------------------------------------------------------------------------
// The serve session

export interface ServeOptions {
  /** Portfolio folder, as the user typed it (issue paths are shown under it). */
  dir: string;
  /** Where the site is built; default a new temporary folder, removed on close. */
  outDir?: string;
  /** Default 8080; 0 = any free port. */
  port?: number;
  /** When the port is taken, try the next ones (default true when no port was chosen). */
  portFallback?: boolean;
  /** Quiet time after the last change before a rebuild (default 300 ms). */
  debounceMs?: number;
  /** Build date (SOURCE_DATE_EPOCH), as for build. */
  buildDate?: string;
  out: (s: string) => void;
  err: (s: string) => void;
}

export interface ServeSession {
  url: string;
  outDir: string;
  /** Resolves when no rebuild runs or waits (for tests). */
  idle(): Promise<void>;
  /** Number of builds that produced a site (the first one included). */
  readonly buildsSucceeded: number;
  /** Stops watching and serving, waits for a running build; removes the temporary site folder when serve made it. */
  close(): Promise<void>;
  /**
   * For Ctrl-C: stops watching and serving without waiting for a running build, removes that
   * build's scratch folder and serve's temporary folder. The caller then exits the process.
   */
  stopNow(): Promise<void>;
}

const HOST = "127.0.0.1";

/** Reads OUT/data/findings.json; [] when the build wrote none. */
async function readFindings(outDir: string): Promise<FindingRow[]> {
  try {
    const rows = JSON.parse(await readFile(join(outDir, "data", "findings.json"), "utf8")) as unknown;
    return Array.isArray(rows) ? (rows as FindingRow[]) : [];
  } catch {
    return [];
  }
}

/** Paths serve never treats as input: dotfiles and folders, editor backups and swap files. */
export function isIgnoredInputPath(relPath: string): boolean {
  if (relPath === "") return false;
  return relPath.split(/[\\/]/).some((part) => part.startsWith(".") || part.endsWith("~") || /\.(swp|swx|tmp)$/i.test(part) || part === "node_modules");
}

/**
 * Starts the watcher and the server, then the first build. Resolves when the server listens; until
 * a build has succeeded it answers 503 (`idle()` resolves when the first build, and any rebuild
 * queued meanwhile, has ended).
 * @throws OhmbookError when the folder does not exist or no port can be had.
 */
export async function startServe(options: ServeOptions): Promise<ServeSession> {
  const { buildPortfolioSite, defaultCacheDir } = await import("../pipeline/index.ts");
  const dir = options.dir;
  const absDir = resolve(dir);
  const dirInfo = await stat(absDir).catch(() => null);
  if (!dirInfo?.isDirectory()) throw new UsageError(`${dir} is not a folder; give the portfolio folder: ohmbook serve DIR`);

  // A wrong --out (inside the portfolio, a folder ohmbook did not write) is refused before anything starts.
  if (options.outDir !== undefined) {
    const { checkOutputFolder } = await import("../site/index.ts");
    await checkOutputFolder(options.outDir, dir);
  }
  const ownOut = options.outDir === undefined;
  const scratchParent = ownOut ? await mkdtemp(join(tmpdir(), "ohmbook-serve-")) : null;
  const outDir = resolve(options.outDir ?? join(scratchParent!, "site"));
  const state = { built: false };
  let previousFindings: FindingRow[] | null = null;
  let previousIssues: Set<string> | null = null;
  let buildsSucceeded = 0;

  /** Prints the problems not printed by the previous build, and a count line when anything changed or errors remain. */
  const printIssues = (issues: readonly InputIssue[]) => {
    const lines = issues.map((i) => formatIssueIn(i, dir));
    const seen = previousIssues;
    const now = new Set(lines);
    const fresh = seen === null ? lines : lines.filter((l) => !seen.has(l));
    const fixed = seen === null ? 0 : [...seen].filter((l) => !now.has(l)).length;
    for (const line of fresh) options.err(`${line}\n`);
    const errors = issues.filter((i) => i.severity === "error").length;
    const warnings = issues.length - errors;
    if (errors > 0 || fresh.length > 0 || fixed > 0) {
      const change = seen === null ? "" : ` (${fresh.length} new, ${fixed} fixed since the previous build)`;
      const effect = errors > 0 ? "; rows and files with errors are left out until fixed" : "";
      options.err(`input: ${errors} error(s), ${warnings} warning(s)${change}${effect}\n`);
    }
    previousIssues = now;
  };

  /** One build; `changed` is empty for the first one. */
  const build = async (changed: string[]): Promise<void> => {
    if (changed.length > 0) options.out(`\nchanged: ${changed.join(", ")}\nrebuilding…\n`);
    const started = Date.now();
    try {
      // The analysis cache beside the output: a rebuild after a change re-analyses the changed buildings only.
      const result = await buildPortfolioSite({ dir, outDir, strict: false, buildDate: options.buildDate, cacheDir: defaultCacheDir(outDir) });
      const seconds = ((Date.now() - started) / 1000).toFixed(1);
      state.built = true;
      buildsSucceeded++;
      printIssues(result.issues);
      const findings = await readFindings(outDir);
      if (previousFindings === null) {
        options.out(`built in ${seconds} s: ${result.summaryText.split("\n")[0]}\n`);
        options.out(`${findings.length} finding(s).\n`);
      } else {
        const lines = describeFindingsDiff(diffFindings(previousFindings, findings));
        options.out(`rebuilt in ${seconds} s; ${lines.length === 0 ? "findings unchanged" : "findings compared with the previous build:"} (${findings.length} in all)\n`);
        for (const line of lines) options.out(`${line}\n`);
        options.out("Reload the page to see the new site.\n");
      }
      previousFindings = findings;
    } catch (error) {
      if (error instanceof InputError) {
        printIssues(error.issues);
        options.err(`ohmbook serve: ${error.message}; ${state.built ? "the previous site is still served" : "no site yet"}. Fix the file and save.\n`);
      } else if (error instanceof OhmbookError) {
        options.err(`ohmbook serve: ${error.message}; ${state.built ? "the previous site is still served" : "no site yet"}\n`);
      } else {
        const detail = error instanceof Error ? (error.stack ?? error.message) : String(error);
        options.err(`ohmbook serve: internal error during the build — please report it with this detail:\n${detail}\n`);
      }
    }
  };

  const queue = new RebuildQueue((changed) => build(changed), options.debounceMs ?? 300);

  // The watcher starts before the first build, so an edit made while it runs is not lost.
  const watcher: FSWatcher = watch(absDir, {
    ignoreInitial: true,
    ignored: (path: string) => {
      const abs = resolve(path);
      if (abs === outDir || abs.startsWith(outDir + sep)) return true;
      return isIgnoredInputPath(relative(absDir, abs));
    },
    // A large interval file saved in several writes is read once, complete.
    awaitWriteFinish: { stabilityThreshold: 150, pollInterval: 50 },
  });
  const onChange = (path: string) => queue.notify(relative(absDir, resolve(path)).split(sep).join("/"));
  watcher.on("add", onChange).on("change", onChange).on("unlink", onChange).on("addDir", onChange).on("unlinkDir", onChange);
  watcher.on("error", (error) => options.err(`ohmbook serve: watching ${dir} failed: ${error instanceof Error ? error.message : String(error)}\n`));
  await new Promise<void>((ready) => watcher.once("ready", () => ready()));

  const server = createServer(handler(outDir, state));
  // A build runs in this process and may hold the event loop for seconds; an idle kept-alive
  // connection must not be closed by a timer that fired meanwhile while the browser reuses it.
  server.keepAliveTimeout = 65_000;
  let port: number;
  try {
    port = await listen(server, HOST, options.port ?? 8080, options.portFallback ?? options.port === undefined);
  } catch (error) {
    await watcher.close();
    await queue.close();
    if (scratchParent) await rm(scratchParent, { recursive: true, force: true });
    throw error;
  }
  const url = `http://${HOST}:${port}/`;
  options.out(`Serving ${url}  (watching ${dir}; Ctrl-C to stop)\nBuilding ${dir}…\n`);
  // The first build goes through the queue like every rebuild, so none ever overlaps it.
  queue.runNow();

  let closing: Promise<void> | null = null;
  return {
    url,
    outDir,
    idle: () => queue.idle(),
    get buildsSucceeded() {
      return buildsSucceeded;
    },
    close() {
      closing ??= (async () => {
        await watcher.close();
        server.closeAllConnections();
        await new Promise<void>((done) => server.close(() => done()));
        await queue.close();
        if (scratchParent) await rm(scratchParent, { recursive: true, force: true });
      })();
      return closing;
    },
    async stopNow() {
      server.closeAllConnections();
      server.close();
      await watcher.close().catch(() => undefined);
      const { removeActiveScratch } = await import("../site/index.ts");
      removeActiveScratch();
      if (scratchParent) rmSync(scratchParent, { recursive: true, force: true });
    },
  };
}
