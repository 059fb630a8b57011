/**
 * The `ohmbook` command line. The only module that reads argv, writes to stdout/stderr
 * and decides exit codes; everything else returns values or throws OhmbookError.
 *
 * Exit codes (see docs/cli.md): 0 ok; 1 input errors or usage error; 3 `--fail-on` threshold crossed.
 */
import { parseArgs } from "node:util";
import { resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { InputError, OhmbookError, UsageError } from "../core/errors.ts";
import { formatIssueIn } from "../core/issues.ts";
import { consoleReporter } from "./progress.ts";
import { BUILD_USAGE, CHECK_USAGE, INIT_USAGE, MERGE_USAGE, SERVE_USAGE, defaultPortfolioDir, ohmbookVersion, wantsHelp } from "./usage.ts";

const HELP = `ohmbook — utility bills, interval data, weather and tariffs in; a checked, forecast static site out.

Usage:
  ohmbook build [DIR] [--out OUT] [--fail-on warning|error] [--jobs N] [--cache DIR|--no-cache] [--strict] [--quiet] [--json]
  ohmbook check [DIR] [--quiet] [--json]
  ohmbook build DIR --shard K/N|auto --partial PARTIAL    analyse one shard of the buildings
  ohmbook merge PARTIAL... --out OUT                       the site from every shard's partial
  ohmbook serve [DIR] [--port N] [--out OUT]     build, serve on 127.0.0.1, rebuild on every change
  ohmbook price --tariff FILE (--usage N --from D --to D [--demand KW] [--pf PF] [--unit U]
                | --intervals CSV --meter ID --from D --to D) [--timezone ZONE] [--estimate] [--json]
  ohmbook init DIR
  ohmbook import espi FILE... --into DIR --building ID [--timezone ZONE] [--tariff ID]

  ohmbook COMMAND --help   options of one command
  ohmbook --version        the version

DIR defaults to the current folder when it holds portfolio.yaml, else data/demo; OUT to _site.
Exit codes: 0 ok, 1 input or usage errors (nothing written), 3 findings reached --fail-on.`;

export interface CliIo {
  out: (s: string) => void;
  err: (s: string) => void;
  isTty: boolean;
  /** Width of the terminal (stderr), for the progress line. */
  columns?: number;
  /** SOURCE_DATE_EPOCH (reproducible-builds convention): seconds since 1970 that date the build. */
  sourceDateEpoch?: string;
  /** The folder a missing DIR is looked for in (default: the process's current folder). */
  cwd?: string;
  /** Environment for `--shard auto` (default: process.env). */
  env?: Readonly<Record<string, string | undefined>>;
}

const processIo: CliIo = {
  out: (s) => process.stdout.write(s),
  err: (s) => process.stderr.write(s),
  isTty: Boolean(process.stderr.isTTY),
  columns: process.stderr.columns,
  sourceDateEpoch: process.env.SOURCE_DATE_EPOCH,
};

/**
 * The build date from SOURCE_DATE_EPOCH (https://reproducible-builds.org/specs/source-date-epoch/):
 * a non-negative integer of seconds since 1970-01-01 UTC. Absent → undefined (the build is then
 * dated by the portfolio's data); malformed → a usage error.
 */
export function buildDateFromEpoch(value: string | undefined): string | undefined {
  if (value === undefined || value === "") return undefined;
  if (!/^\d{1,12}$/.test(value)) throw new UsageError(`SOURCE_DATE_EPOCH must be a whole number of seconds since 1970-01-01 UTC, got '${value.slice(0, 40)}'`);
  return new Date(Number(value) * 1000).toISOString().slice(0, 10);
}

/** Runs one CLI invocation and returns its exit code (never throws). */
export async function runCli(argv: string[], io: CliIo = processIo): Promise<number> {
  const [command, ...rest] = argv;
  try {
    if (command === "--version" || command === "-v" || command === "version") {
      io.out(`ohmbook ${ohmbookVersion()}\n`);
      return 0;
    }
    // `ohmbook help build` is `ohmbook build --help`.
    if (command === "help" && rest[0] !== undefined) return await runCli([rest[0], "--help"], io);
    const usage: Record<string, string> = { build: BUILD_USAGE, check: CHECK_USAGE, init: INIT_USAGE, serve: SERVE_USAGE, merge: MERGE_USAGE };
    if (command !== undefined && usage[command] !== undefined && wantsHelp(rest)) {
      io.out(`${usage[command]}\n`);
      return 0;
    }
    switch (command) {
      case "build":
        return await commandBuild(rest, io);
      case "check":
        return await commandCheck(rest, io);
      case "price": {
        const { runPrice } = await import("./price.ts");
        return await runPrice(rest, { out: (s) => io.out(s.endsWith("\n") ? s : `${s}\n`), err: (s) => io.err(s.endsWith("\n") ? s : `${s}\n`) });
      }
      case "init":
        return await commandInit(rest, io);
      case "serve":
        return await commandServe(rest, io);
      case "merge":
        return await commandMerge(rest, io);
      case "import": {
        const { runImport } = await import("./import.ts");
        return await runImport(rest, io);
      }
      case undefined:
      case "help":
      case "--help":
      case "-h":
        io.out(`${HELP}\n`);
        return command === undefined ? 1 : 0;
      default:
        throw new UsageError(`unknown command '${command}'; expected build, check, serve, price, init or import`);
    }
  } catch (error) {
    return reportError(error, io);
  }
}

function reportError(error: unknown, io: CliIo): number {
  if (error instanceof InputError) {
    for (const issue of error.issues) io.err(`${formatIssueIn(issue, error.folder)}\n`);
    io.err(`ohmbook: ${error.message}; nothing was written\n`);
    return 1;
  }
  if (error instanceof UsageError) {
    io.err(`ohmbook: ${error.message}\nRun 'ohmbook help' for usage.\n`);
    return 1;
  }
  if (error instanceof OhmbookError) {
    io.err(`ohmbook: ${error.message}\n`);
    return 1;
  }
  // A bug, not a user error: say so plainly, keep the detail for the report.
  const detail = error instanceof Error ? (error.stack ?? error.message) : String(error);
  io.err(`ohmbook: internal error — please report it with this detail:\n${detail}\n`);
  return 1;
}

function parse(args: string[], options: NonNullable<NonNullable<Parameters<typeof parseArgs>[0]>["options"]>) {
  try {
    return parseArgs({ args, options, allowPositionals: true, strict: true });
  } catch (error) {
    throw new UsageError(error instanceof Error ? error.message : String(error));
  }
}

async function commandBuild(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parse(args, {
    out: { type: "string", short: "o" },
    "fail-on": { type: "string" },
    audience: { type: "string" },
    strict: { type: "boolean" },
    quiet: { type: "boolean", short: "q" },
    json: { type: "boolean" },
    jobs: { type: "string", short: "j" },
    cache: { type: "string" },
    "no-cache": { type: "boolean" },
    shard: { type: "string" },
    partial: { type: "string" },
  });
  if (positionals.length > 1) throw new UsageError(`build takes one folder, got ${positionals.length}`);
  const jobs = parseJobs(values.jobs as string | undefined);
  if (values.cache !== undefined && values["no-cache"]) throw new UsageError("--cache and --no-cache cannot both be given");
  const failOn = values["fail-on"] as string | undefined;
  if (failOn !== undefined && failOn !== "warning" && failOn !== "error") {
    throw new UsageError(`--fail-on must be 'warning' or 'error', got '${failOn}'`);
  }
  const audience = (values.audience as string | undefined) ?? "internal";
  if (audience !== "internal" && audience !== "tenants") {
    throw new UsageError(`--audience must be 'internal' (the full site) or 'tenants' (tenant pages only), got '${audience.slice(0, 40)}'`);
  }
  const quiet = Boolean(values.quiet) || Boolean(values.json);
  const reporter = consoleReporter({ quiet, tty: io.isTty, write: io.err, width: io.columns ? io.columns - 1 : undefined });
  const { buildPortfolioSite, buildShard, defaultCacheDir, parseShard } = await import("../pipeline/index.ts");
  const dir = positionals[0] ?? defaultPortfolioDir(io.cwd ?? process.cwd());
  if ((values.shard === undefined) !== (values.partial === undefined)) throw new UsageError("--shard and --partial go together: --shard K/N --partial DIR");
  if (values.shard !== undefined) {
    const shard = parseShard(values.shard as string, io.env ?? process.env);
    const r = await buildShard({ dir, shard, partialDir: values.partial as string, strict: Boolean(values.strict), reporter, jobs }).catch((error: unknown) => {
      if (error instanceof InputError && error.folder === undefined) error.folder = dir;
      throw error;
    });
    for (const issue of r.issues) if (!quiet || issue.severity === "error") io.err(`${formatIssueIn(issue, dir)}\n`);
    if (values.json) io.out(`${JSON.stringify({ shard: r.shard, buildings: r.buildings, buildingsFailed: r.failed, issues: r.issues }, null, 2)}\n`);
    else if (!quiet) io.out(`Shard ${r.shard.index} of ${r.shard.count}: ${r.buildings.length} building(s) analysed into ${values.partial as string}${r.failed.length ? `; ${r.failed.length} could not be analysed` : ""}\nMerge every shard with: ohmbook merge PARTIAL_1 … PARTIAL_${r.shard.count} --out SITE\n`);
    return 0;
  }
  const outDir = (values.out as string | undefined) ?? "_site";
  const cacheDir = values["no-cache"] ? undefined : ((values.cache as string | undefined) ?? defaultCacheDir(outDir));
  const result = await buildPortfolioSite({
    dir,
    outDir,
    strict: Boolean(values.strict),
    reporter,
    buildDate: buildDateFromEpoch(io.sourceDateEpoch),
    // A bug in one building is reported and the other pages are still written (unless --strict).
    onBug: "report",
    audience,
    jobs,
    cacheDir,
  }).catch((error: unknown) => {
    if (error instanceof InputError && error.folder === undefined) error.folder = dir;
    throw error;
  });
  for (const issue of result.issues) if (!quiet || issue.severity === "error") io.err(`${formatIssueIn(issue, dir)}\n`);
  const crossed = failOn ? result.findingsAtOrAbove(failOn) : 0;
  if (values.json) {
    // Warnings are part of the machine-readable answer, not only of the terminal's.
    io.out(`${JSON.stringify({ ...result.summary, issues: result.issues }, null, 2)}\n`);
  } else if (!quiet) {
    io.out(`${result.summaryText}\n`);
  }
  if (failOn && crossed > 0) {
    io.err(`ohmbook: ${crossed} finding(s) at or above '${failOn}' (--fail-on)\n`);
    return 3;
  }
  return 0;
}

/** `--jobs N`: a whole number ≥ 1; absent → undefined (the pipeline's default, every core). */
export function parseJobs(value: string | undefined): number | undefined {
  if (value === undefined) return undefined;
  if (!/^[1-9]\d{0,3}$/.test(value)) throw new UsageError(`--jobs must be a whole number of worker threads from 1 to 9999, got '${value.slice(0, 40)}'`);
  return Number(value);
}

async function commandCheck(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parse(args, {
    quiet: { type: "boolean", short: "q" },
    json: { type: "boolean" },
  });
  const dir = positionals[0] ?? defaultPortfolioDir(io.cwd ?? process.cwd());
  const { loadPortfolio } = await import("../ingest/index.ts");
  const result = await loadPortfolio(dir);
  const errors = result.issues.filter((i) => i.severity === "error");
  if (values.json) {
    io.out(`${JSON.stringify({ ok: errors.length === 0, issues: result.issues, files: result.portfolio?.report.files ?? [] }, null, 2)}\n`);
  } else {
    for (const issue of result.issues) {
      if (!values.quiet || issue.severity === "error") io.out(`${formatIssueIn(issue, dir)}\n`);
    }
    if (!values.quiet) {
      const warnings = result.issues.length - errors.length;
      io.out(errors.length === 0 ? `${dir}: no errors (${warnings} warning(s))\n` : `${dir}: ${errors.length} error(s), ${warnings} warning(s)\n`);
    }
  }
  return errors.length === 0 ? 0 : 1;
}

async function commandInit(args: string[], io: CliIo): Promise<number> {
  const { positionals } = parse(args, {});
  if (positionals.length !== 1) throw new UsageError("init needs exactly one folder: ohmbook init DIR");
  const { writeStarterPortfolio } = await import("./init.ts");
  const written = await writeStarterPortfolio(positionals[0]!);
  io.out(`Wrote a starter portfolio to ${positionals[0]} (${written.length} files). Next: ohmbook check ${positionals[0]}\n`);
  return 0;
}

/**
 * What Ctrl-C (or a kill) does while a command that runs until stopped is running; null = the
 * default (remove a build's scratch folders, exit 130/143).
 */
let onStopSignal: ((signal: NodeJS.Signals) => void) | null = null;

async function commandServe(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parse(args, {
    port: { type: "string", short: "p" },
    out: { type: "string", short: "o" },
  });
  if (positionals.length > 1) throw new UsageError(`serve takes one folder, got ${positionals.length}`);
  const portText = values.port as string | undefined;
  if (portText !== undefined && !/^\d{1,5}$/.test(portText)) throw new UsageError(`--port must be a number from 0 to 65535, got '${portText.slice(0, 40)}'`);
  const port = portText === undefined ? undefined : Number(portText);
  if (port !== undefined && port > 65535) throw new UsageError(`--port must be a number from 0 to 65535, got ${port}`);
  const dir = positionals[0] ?? defaultPortfolioDir(io.cwd ?? process.cwd());
  const { startServe } = await import("./serve.ts");
  // Runs until Ctrl-C: stop watching and serving, drop a build in progress (its scratch folder
  // is removed; the served folder is the old site or the new one), remove the temporary site.
  let stopped: ((code: number) => void) | null = null;
  const whenStopped = new Promise<number>((done) => (stopped = done));
  let session: Awaited<ReturnType<typeof startServe>> | null = null;
  let stopSignal: NodeJS.Signals | null = null;
  const stop = (signal: NodeJS.Signals) => {
    onStopSignal = null;
    void session!.stopNow().finally(() => {
      io.err(`ohmbook serve: stopped (${signal})\n`);
      stopped!(0);
      process.exit(0);
    });
  };
  // Set before serve starts, so a Ctrl-C during start-up also cleans up.
  onStopSignal = (signal) => {
    stopSignal = signal;
    if (session) stop(signal);
  };
  session = await startServe({
    dir,
    outDir: values.out as string | undefined,
    port,
    buildDate: buildDateFromEpoch(io.sourceDateEpoch),
    out: io.out,
    err: io.err,
  }).catch((error: unknown) => {
    onStopSignal = null;
    throw error;
  });
  if (stopSignal) stop(stopSignal);
  return await whenStopped;
}

// Run when executed directly (tsx src/cli/main.ts …), not when imported by tests.
const invokedDirectly = process.argv[1] !== undefined && resolve(process.argv[1]) === fileURLToPath(import.meta.url);
if (invokedDirectly) {
  // Ctrl-C or a kill: remove the build's scratch folders and stop; the published site is
  // either the old one or the new one (a swap cut in half is repaired by the next build).
  for (const [signal, code] of [["SIGINT", 130], ["SIGTERM", 143]] as const) {
    process.once(signal, () => {
      if (onStopSignal) {
        onStopSignal(signal);
        return;
      }
      void import("../site/index.ts").then(({ removeActiveScratch }) => {
        removeActiveScratch();
        process.stderr.write(`ohmbook: stopped by ${signal}; nothing half-written was left behind\n`);
        process.exit(code);
      });
    });
  }
  runCli(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });
}

async function commandMerge(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parse(args, {
    out: { type: "string", short: "o" },
    portfolio: { type: "string" },
    "fail-on": { type: "string" },
    quiet: { type: "boolean", short: "q" },
    json: { type: "boolean" },
  });
  const failOn = values["fail-on"] as string | undefined;
  if (failOn !== undefined && failOn !== "warning" && failOn !== "error") throw new UsageError(`--fail-on must be 'warning' or 'error', got '${failOn}'`);
  const quiet = Boolean(values.quiet) || Boolean(values.json);
  const reporter = consoleReporter({ quiet, tty: io.isTty, write: io.err, width: io.columns ? io.columns - 1 : undefined });
  const { mergeShards } = await import("../pipeline/index.ts");
  const result = await mergeShards({
    partials: positionals,
    dir: values.portfolio as string | undefined,
    outDir: (values.out as string | undefined) ?? "_site",
    strict: false,
    reporter,
    buildDate: buildDateFromEpoch(io.sourceDateEpoch),
    onBug: "report",
  });
  for (const issue of result.issues) if (!quiet || issue.severity === "error") io.err(`${formatIssueIn(issue, values.portfolio as string | undefined)}\n`);
  if (values.json) io.out(`${JSON.stringify({ ...result.summary, issues: result.issues }, null, 2)}\n`);
  else if (!quiet) io.out(`${result.summaryText}\n`);
  const crossed = failOn ? result.findingsAtOrAbove(failOn) : 0;
  if (failOn && crossed > 0) {
    io.err(`ohmbook: ${crossed} finding(s) at or above '${failOn}' (--fail-on)\n`);
    return 3;
  }
  return 0;
}
