/**
 * Help texts of every command, the version, and the default portfolio folder: what `--help`,
 * `--version` and a missing DIR mean, in one place.
 */
import { existsSync, readFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

export const BUILD_USAGE = `Usage: ohmbook build [DIR] [--out OUT] [--fail-on warning|error] [--audience internal|tenants] [--jobs N]
                     [--cache DIR | --no-cache] [--strict] [--quiet] [--json]

Reads the portfolio folder DIR and writes the static site to OUT.

Options:
  -o, --out OUT          where the site goes (default _site)
  --fail-on LEVEL        exit 3 when an audit finding reaches LEVEL: warning or error
  --audience WHO         internal (default): the full site; tenants: only the tenant pages,
                         with no internal page, link, CSV or JSON, to publish separately
  -j, --jobs N           analyse N buildings at a time in worker threads (default: the number
                         of cores); the site is the same for any N
  --cache DIR            keep each building's analysis in DIR and reuse it while the building's
                         files, the settings and ohmbook are unchanged (default: .OUT.ohmbook-cache
                         beside OUT, never inside it)
  --no-cache             analyse every building, and keep nothing
  --shard K/N|auto       analyse only shard K of N (a stable hash of each building id) and
                         write its analyses to --partial DIR; 'ohmbook merge' writes the site.
                         auto reads a Kubernetes Indexed Job (JOB_COMPLETION_INDEX, JOB_COMPLETIONS)
                         or a Slurm array (SLURM_ARRAY_TASK_ID, _MIN, _COUNT)
  --partial DIR          where a shard's analyses go (with --shard)
  --strict               any rejected input row fails the build (exit 1, nothing written)
  -q, --quiet            print only errors
  --json                 print a machine-readable summary on stdout, with every warning and error
  -h, --help             show this help

DIR defaults to the current folder when it holds portfolio.yaml, else data/demo.
Exit codes: 0 built; 1 input errors (nothing written); 3 --fail-on reached.`;

export const MERGE_USAGE = `Usage: ohmbook merge PARTIAL... --out OUT [--portfolio DIR] [--fail-on warning|error] [--quiet] [--json]

Writes the site and every portfolio-level file from the partial results of
'ohmbook build DIR --shard K/N --partial PARTIAL', one per shard: disputes, forecast and pages
are computed once, exactly as one build on one machine would (the site is byte-identical).
Refuses a missing or repeated shard, and partials of another portfolio or ohmbook version.

Options:
  -o, --out OUT          where the site goes (default _site)
  --portfolio DIR        the portfolio folder (default: the one the shards read)
  --fail-on LEVEL        exit 3 when an audit finding reaches LEVEL: warning or error
  -q, --quiet            print only errors
  --json                 print a machine-readable summary on stdout
  -h, --help             show this help

Exit codes: 0 built; 1 input or partial errors (nothing written); 3 --fail-on reached.`;

export const CHECK_USAGE = `Usage: ohmbook check [DIR] [--quiet] [--json]

Validates every input file of the portfolio folder DIR and prints file:line:column: message for
each problem. Writes nothing.

Options:
  -q, --quiet            print only errors
  --json                 print {ok, issues, files} as JSON (warnings included)
  -h, --help             show this help

DIR defaults to the current folder when it holds portfolio.yaml, else data/demo.
Exit codes: 0 no errors (warnings allowed); 1 errors.`;

export const INIT_USAGE = `Usage: ohmbook init DIR

Writes a small commented starter portfolio into DIR (which must be new or empty), ready for
'ohmbook check DIR' and 'ohmbook build DIR'.

Options:
  -h, --help             show this help

Exit codes: 0 written; 1 DIR is not empty or cannot be written.`;

export const SERVE_USAGE = `Usage: ohmbook serve [DIR] [--port N] [--out OUT]

Builds the site of the portfolio folder DIR, serves it on http://127.0.0.1:PORT/ and rebuilds it
whenever an input file in DIR changes (a tariff, bills.csv, interval data, ...). Each rebuild
prints the files that changed, the findings that are new or gone since the previous build, and
any input problem as file:line:column: message; a failed rebuild keeps the previous site served.

Options:
  -p, --port N           port on 127.0.0.1 (default 8080, or the next free one; 0 = any free port)
  -o, --out OUT          build into OUT and keep it (default: a temporary folder, removed on exit)
  -h, --help             show this help

DIR defaults to the current folder when it holds portfolio.yaml, else data/demo.
Stop with Ctrl-C (exit 0). Exit codes: 1 DIR is not a folder or the port cannot be had.`;

/** The version in package.json, found by walking up from this module (source or compiled). */
export function ohmbookVersion(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 5; i++) {
    const candidate = join(dir, "package.json");
    if (existsSync(candidate)) {
      const pkg = JSON.parse(readFileSync(candidate, "utf8")) as { name?: string; version?: string };
      if (pkg.name === "ohmbook" && pkg.version) return pkg.version;
    }
    dir = dirname(dir);
  }
  return "unknown";
}

/**
 * The portfolio folder when none is given: the current folder if it holds portfolio.yaml (as
 * git finds its repository), else the bundled demo `data/demo`.
 */
export function defaultPortfolioDir(cwd: string): string {
  if (!existsSync(join(cwd, "portfolio.yaml"))) return "data/demo";
  return cwd === process.cwd() ? "." : cwd;
}

/** True when the arguments ask for help anywhere (`--help` or `-h`), as most CLIs accept. */
export function wantsHelp(args: readonly string[]): boolean {
  const end = args.indexOf("--");
  return (end < 0 ? args : args.slice(0, end)).some((a) => a === "--help" || a === "-h");
}
