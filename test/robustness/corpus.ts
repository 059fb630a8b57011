/**
 * The malformed-input corpus (issue 16, item 1): a generator that mutates one small valid
 * portfolio (test/fixtures/ingest/good) in a few hundred ways across every input file, each
 * case stating what must happen.
 *
 * Where the expected outcomes come from: the input contract (/work/shared/spec/inputs.md:
 * strict numbers and ISO dates, RFC 4180 CSV, every rejected row reported at file:line, nothing
 * lost silently), the tariff format (/work/shared/spec/tariff-format.md: strict keys and types),
 * the limits in src/ingest/limits.ts and src/tariff/yaml-check.ts (each with its reason), and
 * RFC 4180 for quoting and line breaks. Whole-file problems (unreadable, not a file) are at line 0.
 */
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";

export const BASE = "test/fixtures/ingest/good";

/** What a case must produce. */
export type Expectation =
  /** No error (warnings allowed). */
  | { outcome: "valid" }
  /** No error, and a warning in `file` (at `line` when given). */
  | { outcome: "warning"; file: string; line?: number }
  /** An error at `file:line`; `fatal` when the portfolio cannot be built at all. */
  | { outcome: "error"; file: string; line: number; fatal?: boolean };

/** A file's content, or something that is not a regular file. */
export type Entry =
  | { kind: "file"; bytes: Buffer }
  | { kind: "dir" }
  | { kind: "fifo" }
  /** `target` relative to the portfolio folder, or absolute with `outside` (a temp folder). */
  | { kind: "symlink"; target: string; outside?: boolean };

export interface Case {
  name: string;
  /** The portfolio: path relative to the folder → entry. */
  files: Map<string, Entry>;
  expect: Expectation;
  /** Buildings loaded when the case is not fatal (2 in the base). */
  buildings: number;
  /** Exact rows rejected in one file, when the case pins it (a stray quote costs one row). */
  rejected?: { file: string; rows: number };
}

/** The base portfolio as entries. */
export function baseFiles(): Map<string, Entry> {
  const out = new Map<string, Entry>();
  const walk = (rel: string): void => {
    for (const name of readdirSync(join(BASE, rel))) {
      const r = rel === "" ? name : `${rel}/${name}`;
      if (statSync(join(BASE, r)).isDirectory()) walk(r);
      else out.set(r, { kind: "file", bytes: readFileSync(join(BASE, r)) });
    }
  };
  walk("");
  return out;
}

const text = (files: Map<string, Entry>, path: string): string => {
  const e = files.get(path);
  if (!e || e.kind !== "file") throw new Error(`no file ${path}`);
  return e.bytes.toString("utf8");
};
const put = (files: Map<string, Entry>, path: string, content: string | Buffer): void => {
  files.set(path, { kind: "file", bytes: typeof content === "string" ? Buffer.from(content, "utf8") : content });
};
/** Replaces 1-based line `n` of a file. */
const setLine = (files: Map<string, Entry>, path: string, n: number, f: (line: string) => string): void => {
  const lines = text(files, path).split("\n");
  lines[n - 1] = f(lines[n - 1]);
  put(files, path, lines.join("\n"));
};
/** Sets the cell in column `col` (0-based) of line `n` (lines without quoted commas only). */
const setCell = (files: Map<string, Entry>, path: string, n: number, col: number, value: string): void =>
  setLine(files, path, n, (l) => {
    const cells = l.split(",");
    cells[col] = value;
    return cells.join(",");
  });

/** One CSV input file of the base, with the line and columns the mutations use. */
interface CsvFile {
  path: string;
  /** A data line whose cells contain no quoted comma. */
  line: number;
  /** 0-based numeric columns with their names. */
  numeric: Record<string, number>;
  /** Optional numeric columns (an empty cell is valid). */
  optional: string[];
  /** Buildings left when the mutated row is rejected (2, or 1 when the row is a building's). */
  buildingsIfRowLost: number;
  /** Missing or unreadable → fatal (buildings, meters, bills). */
  required: boolean;
  /** Index of an id column and whether a trailing space variant must still match. */
  idColumn: number | null;
}

const CSV_FILES: CsvFile[] = [
  { path: "buildings.csv", line: 3, numeric: { floor_area: 2 }, optional: [], buildingsIfRowLost: 1, required: true, idColumn: 5 },
  { path: "meters.csv", line: 3, numeric: { multiplier: 5 }, optional: ["multiplier"], buildingsIfRowLost: 2, required: true, idColumn: 0 },
  { path: "bills.csv", line: 3, numeric: { usage: 3, demand: 5, power_factor: 6, total: 7 }, optional: ["demand", "power_factor"], buildingsIfRowLost: 2, required: true, idColumn: 0 },
  { path: "bill_lines.csv", line: 3, numeric: { amount: 2 }, optional: [], buildingsIfRowLost: 2, required: false, idColumn: 0 },
  { path: "intervals/E-100-2024.csv", line: 3, numeric: { value: 2 }, optional: [], buildingsIfRowLost: 2, required: false, idColumn: 0 },
  { path: "weather/kxaa-hourly.csv", line: 3, numeric: { temperature_f: 2 }, optional: [], buildingsIfRowLost: 2, required: false, idColumn: 0 },
  { path: "weather/kxaa-daily.csv", line: 2, numeric: { tmax_c: 2, tmin_c: 3 }, optional: [], buildingsIfRowLost: 2, required: false, idColumn: 0 },
  { path: "weather/normals/kxaa.csv", line: 3, numeric: { temperature_c: 2 }, optional: [], buildingsIfRowLost: 2, required: false, idColumn: 0 },
];

/** Numbers no reader may accept, in any numeric column (inputs contract; limits.ts). */
const BAD_NUMBERS: [string, string][] = [
  ["1e308 (finite, beyond every limit)", "1e308"],
  ["-1e308", "-1e308"],
  ["1e400 (overflows to Infinity)", "1e400"],
  ["NaN", "NaN"],
  ["thousands separator", "1,234"],
  ["currency symbol", "$5"],
  ["hexadecimal", "0x1F"],
  ["full-width digits", "\uFF11\uFF12"],
];

/** Deterministic bytes that are not text (a linear congruential generator), no line break in the first 200. */
function garbage(n: number): Buffer {
  const b = Buffer.alloc(n);
  let x = 12345;
  for (let i = 0; i < n; i++) {
    x = (x * 1103515245 + 12345) & 0x7fffffff;
    let v = x & 0xff;
    if (i < 200 && (v === 10 || v === 13)) v = 0xfe;
    b[i] = v;
  }
  return b;
}

/** Every case of the corpus, in a stable order. */
export function generateCases(): Case[] {
  const cases: Case[] = [];
  const add = (name: string, expect: Expectation, mutate: (f: Map<string, Entry>) => void, extra: Partial<Pick<Case, "buildings" | "rejected">> = {}): void => {
    const files = baseFiles();
    mutate(files);
    cases.push({ name, files, expect, buildings: extra.buildings ?? 2, rejected: extra.rejected });
  };

  for (const f of CSV_FILES) {
    const p = f.path;
    const rowError = (line = f.line): Expectation => ({ outcome: "error", file: p, line });
    const fileError = (line: number): Expectation => ({ outcome: "error", file: p, line, fatal: f.required });
    const lost = f.buildingsIfRowLost;

    // Line endings and encodings that must read exactly like the base (RFC 4180; inputs contract).
    add(`${p}: CRLF line endings`, { outcome: "valid" }, (fs) => put(fs, p, text(fs, p).replace(/\n/g, "\r\n")));
    add(`${p}: CR-only line endings`, { outcome: "valid" }, (fs) => put(fs, p, text(fs, p).replace(/\n/g, "\r")));
    add(`${p}: no final line break`, { outcome: "valid" }, (fs) => put(fs, p, text(fs, p).replace(/\n+$/, "")));
    add(`${p}: byte order mark`, { outcome: "valid" }, (fs) => put(fs, p, `\uFEFF${text(fs, p)}`));
    add(`${p}: blank lines between rows`, { outcome: "valid" }, (fs) => put(fs, p, text(fs, p).replace(/\n/g, "\n\n")));
    if (f.idColumn !== null) {
      add(`${p}: no-break space after the id`, { outcome: "valid" }, (fs) => setLine(fs, p, f.line, (l) => l.replace(/^([^,]*),/, "$1\u00A0,").replace(/^([^,]*,[^,]*,[^,]*,[^,]*,[^,]*),(KXAA)/, "$1,$2\u00A0")));
      add(`${p}: zero-width space and BOM around the id`, { outcome: "valid" }, (fs) => setLine(fs, p, f.line, (l) => `\uFEFF${l.replace(/^([^,]*),/, "$1\u200B,")}`));
    }

    // Quoting: a stray quote costs exactly its own row (issue 16).
    add(`${p}: stray quote opening a cell`, rowError(), (fs) => setLine(fs, p, f.line, (l) => l.replace(/,([^,]*)$/, ',"$1')), { buildings: lost, rejected: { file: p, rows: 1 } });
    add(`${p}: text after a closing quote`, rowError(), (fs) => setLine(fs, p, f.line, (l) => l.replace(/,([^,]*)$/, ',"$1"x')), { buildings: lost, rejected: { file: p, rows: 1 } });
    add(`${p}: properly quoted cells`, { outcome: "valid" }, (fs) => setLine(fs, p, f.line, (l) => l.split(",").map((c) => `"${c}"`).join(",")));

    // Row shape and bytes.
    add(`${p}: a stray comma (one field too many)`, rowError(), (fs) => setLine(fs, p, f.line, (l) => `${l},extra`), { buildings: lost });
    add(`${p}: NUL byte in a row`, rowError(), (fs) => setLine(fs, p, f.line, (l) => l.replace(",", ",\u0000")), { buildings: lost });
    add(`${p}: 1 MB cell in a number column`, rowError(), (fs) => setCell(fs, p, f.line, Object.values(f.numeric)[0], "7".repeat(1_000_000) + "x"), { buildings: lost });

    // Numbers at and beyond the edges.
    for (const [col, idx] of Object.entries(f.numeric)) {
      for (const [label, value] of BAD_NUMBERS) {
        add(`${p}: ${col} = ${label}`, rowError(), (fs) => setCell(fs, p, f.line, idx, value), { buildings: lost });
      }
      if (f.optional.includes(col)) add(`${p}: ${col} empty (optional)`, { outcome: "valid" }, (fs) => setCell(fs, p, f.line, idx, ""));
      else add(`${p}: ${col} empty (required)`, rowError(), (fs) => setCell(fs, p, f.line, idx, ""), { buildings: lost });
    }

    // Headers.
    add(`${p}: unknown extra column`, { outcome: "warning", file: p, line: 1 }, (fs) => put(fs, p, text(fs, p).split("\n").map((l, i) => (l === "" ? l : `${l},${i === 0 ? "colour" : "red"}`)).join("\n")));
    add(`${p}: a column named twice`, { outcome: "warning", file: p, line: 1 }, (fs) => put(fs, p, text(fs, p).split("\n").map((l) => (l === "" ? l : `${l},${l.split(",")[0]}`)).join("\n")));
    add(`${p}: first column missing from the header`, fileError(1), (fs) => put(fs, p, text(fs, p).split("\n").map((l) => l.split(",").slice(1).join(",")).join("\n")));

    // Whole-file problems: every one a message at file:0 (or its header line), never a crash or a hang.
    add(`${p}: empty file`, fileError(0), (fs) => put(fs, p, ""));
    add(`${p}: binary garbage`, fileError(1), (fs) => put(fs, p, garbage(3000)));
    add(`${p}: a folder`, fileError(0), (fs) => fs.set(p, { kind: "dir" }));
    add(`${p}: a FIFO`, fileError(0), (fs) => fs.set(p, { kind: "fifo" }));
    add(`${p}: symbolic link outside the folder`, fileError(0), (fs) => fs.set(p, { kind: "symlink", target: "outside.csv", outside: true }));
    add(`${p}: dangling symbolic link`, fileError(0), (fs) => fs.set(p, { kind: "symlink", target: "does-not-exist.csv" }));
    add(`${p}: symbolic link inside the folder`, { outcome: "valid" }, (fs) => {
      const e = fs.get(p)!;
      fs.set(`store/${p.replace(/\//g, "_")}`, e);
      fs.set(p, { kind: "symlink", target: `store/${p.replace(/\//g, "_")}` });
    });
  }

  // Dates, periods and timestamps.
  const bills = "bills.csv";
  for (const [label, value] of [["year 0000", "0000-04-01"], ["30 February", "2024-02-30"], ["29 February of a common year", "2023-02-29"], ["no zero padding", "2024-4-1"], ["day/month/year", "01/04/2024"], ["year 9999", "9999-04-01"]]) {
    add(`bills.csv: period_start ${label}`, { outcome: "error", file: bills, line: 3 }, (fs) => setCell(fs, bills, 3, 1, value));
  }
  add("bills.csv: a 100-year period", { outcome: "error", file: bills, line: 3 }, (fs) => setCell(fs, bills, 3, 2, "2124-05-01"));
  add("bills.csv: period_end equal to period_start", { outcome: "error", file: bills, line: 3 }, (fs) => setCell(fs, bills, 3, 2, "2024-04-01"));
  add("bills.csv: statement_date 2024-13-01", { outcome: "error", file: bills, line: 2 }, (fs) => setCell(fs, bills, 2, 8, "2024-13-01"));
  add("bills.csv: a leap day is a real day", { outcome: "valid" }, (fs) => setCell(fs, bills, 3, 8, "2024-02-29"));
  add("bills.csv: read_type unknown", { outcome: "error", file: bills, line: 3 }, (fs) => setCell(fs, bills, 3, 4, "guessed"));
  add("bills.csv: meter id differing only in case", { outcome: "error", file: bills, line: 3 }, (fs) => setCell(fs, bills, 3, 0, "e-100"));
  add("bills.csv: formula-looking meter id that is not in meters.csv", { outcome: "error", file: bills, line: 3 }, (fs) => setCell(fs, bills, 3, 0, "=HYPERLINK(1)"));
  add("bills.csv: 1,000 identical bad rows are grouped, all counted", { outcome: "error", file: bills, line: 6 }, (fs) => {
    put(fs, bills, `${text(fs, bills).trimEnd()}\n${Array.from({ length: 1000 }, () => "NOPE,2024-03-01,2024-04-01,1,actual,,,1,").join("\n")}\n`);
  }, { rejected: { file: bills, rows: 1000 } });

  const iv = "intervals/E-100-2024.csv";
  for (const [label, value] of [["in the spring-forward gap (America/New_York)", "2024-03-10T02:30"], ["month 13", "2024-13-01T00:15"], ["year 0000 with offset", "0000-03-01T00:15Z"], ["offset +25:00", "2024-03-01T00:15+25:00"], ["a date only", "2024-03-01"], ["text", "soon"]]) {
    add(`${iv}: timestamp ${label}`, { outcome: "error", file: iv, line: 3 }, (fs) => setCell(fs, iv, 3, 1, value));
  }
  add(`${iv}: interval_minutes 7`, { outcome: "error", file: iv, line: 3 }, (fs) => put(fs, iv, text(fs, iv).split("\n").map((l, i) => (l === "" ? l : `${l},${i === 0 ? "interval_minutes" : i === 2 ? "7" : "15"}`)).join("\n")));
  add(`${iv}: unknown meter`, { outcome: "error", file: iv, line: 3 }, (fs) => setCell(fs, iv, 3, 0, "X-999"));
  add(`${iv}: negative reading (kept, reported)`, { outcome: "valid" }, (fs) => setCell(fs, iv, 3, 2, "-1"));
  add(`${iv}: 100,000 rows of an unknown meter`, { outcome: "error", file: iv, line: 6 }, (fs) => {
    put(fs, iv, `${text(fs, iv).trimEnd()}\n${Array.from({ length: 100_000 }, (_, i) => `GHOST,2024-03-0${1 + (i % 9)}T00:00,1`).join("\n")}\n`);
  }, { rejected: { file: iv, rows: 100_000 } });
  add(`${iv}: 5,000 repeated readings are grouped, all counted`, { outcome: "error", file: iv, line: 6 }, (fs) => {
    put(fs, iv, `${text(fs, iv).trimEnd()}\n${Array.from({ length: 5000 }, () => "E-100,2024-03-01T00:00,8.25").join("\n")}\n`);
  }, { rejected: { file: iv, rows: 5000 } });
  add("portfolio.yaml: Latin-1 name (not UTF-8)", { outcome: "warning", file: "portfolio.yaml", line: 1 }, (fs) => {
    const b = Buffer.from(text(fs, "portfolio.yaml").replace("Lindenfold", "Lindenf\u0000ld"), "utf8");
    b[b.indexOf(0)] = 0xf6;
    put(fs, "portfolio.yaml", b);
  });
  add("tariffs/fen-gs.yaml: Latin-1 name (not UTF-8)", { outcome: "warning", file: "tariffs/fen-gs.yaml", line: 2 }, (fs) => {
    const b = Buffer.from(text(fs, "tariffs/fen-gs.yaml").replace("Fenwater", "Fenw\u0000ter"), "utf8");
    b[b.indexOf(0)] = 0xe4;
    put(fs, "tariffs/fen-gs.yaml", b);
  });
  add("weather/kxaa-daily.csv: tmin above tmax", { outcome: "error", file: "weather/kxaa-daily.csv", line: 2 }, (fs) => setCell(fs, "weather/kxaa-daily.csv", 2, 3, "20"));
  add("weather/kxaa-hourly.csv: temperature of 200 °F", { outcome: "error", file: "weather/kxaa-hourly.csv", line: 3 }, (fs) => setCell(fs, "weather/kxaa-hourly.csv", 3, 2, "200"));

  // Ids and zones in buildings.csv / meters.csv.
  const bd = "buildings.csv";
  const mt = "meters.csv";
  add("buildings.csv: 300-character building id (too long for a page name)", { outcome: "error", file: bd, line: 3 }, (fs) => {
    setCell(fs, bd, 3, 0, "B".repeat(300));
    setCell(fs, mt, 3, 1, "B".repeat(300));
  }, { buildings: 1 });
  add("buildings.csv: building id with a space", { outcome: "error", file: bd, line: 3 }, (fs) => setCell(fs, bd, 3, 0, "LF 02"), { buildings: 1 });
  add("buildings.csv: duplicate building id", { outcome: "error", file: bd, line: 3 }, (fs) => setCell(fs, bd, 3, 0, "LF-01"), { buildings: 1 });
  add("buildings.csv: building id differing only in case", { outcome: "error", file: bd, line: 3 }, (fs) => setCell(fs, bd, 3, 0, "lf-01"), { buildings: 1 });
  add("meters.csv: meter id differing only in case", { outcome: "error", file: mt, line: 3 }, (fs) => setCell(fs, mt, 3, 0, "e-100"));
  add("buildings.csv: unknown time zone", { outcome: "error", file: bd, line: 3 }, (fs) => setCell(fs, bd, 3, 4, "Mars/Olympus"), { buildings: 1 });
  add("buildings.csv: UTC is a time zone", { outcome: "valid" }, (fs) => setCell(fs, bd, 3, 4, "UTC"));
  add("buildings.csv: area_unit acres", { outcome: "error", file: bd, line: 3 }, (fs) => setCell(fs, bd, 3, 3, "acres"), { buildings: 1 });
  add("buildings.csv: Latin-1 name (not UTF-8)", { outcome: "warning", file: bd, line: 3 }, (fs) => {
    const t = text(fs, bd).replace("Quarry Lane School", "Quarry Lane Sch\u0000ol");
    const b = Buffer.from(t, "utf8");
    b[b.indexOf(0)] = 0xf6; // "ö" in Latin-1: not valid UTF-8
    put(fs, bd, b);
  });
  add("meters.csv: duplicate meter id", { outcome: "error", file: mt, line: 3 }, (fs) => setCell(fs, mt, 3, 0, "E-100"));
  add("meters.csv: 200-character meter id", { outcome: "error", file: mt, line: 3 }, (fs) => setCell(fs, mt, 3, 0, "M".repeat(200)));
  add("meters.csv: 90 '@' characters (short in bytes, too long as a page name)", { outcome: "error", file: mt, line: 3 }, (fs) => setCell(fs, mt, 3, 0, "@".repeat(90)));
  add("meters.csv: unit of another commodity", { outcome: "error", file: mt, line: 3 }, (fs) => setCell(fs, mt, 3, 3, "gal"));
  add("meters.csv: unknown tariff", { outcome: "error", file: mt, line: 3 }, (fs) => setCell(fs, mt, 3, 4, "nope"));
  add("meters.csv: formula-looking meter id, used consistently", { outcome: "valid" }, (fs) => {
    setCell(fs, mt, 3, 0, "@N1-G");
    put(fs, "bills.csv", text(fs, "bills.csv").replace(/^G-200,/gm, "@N1-G,"));
    put(fs, "bill_lines.csv", text(fs, "bill_lines.csv").replace(/^G-200:/gm, "@N1-G:"));
  });

  // portfolio.yaml: wrong types and values for every key (lines: 1 name … 10 weather_max_gap_hours).
  const py = "portfolio.yaml";
  const yamlLine = (n: number, value: string, expect: Expectation, name: string): void =>
    add(`portfolio.yaml: ${name}`, expect, (fs) => setLine(fs, py, n, () => value));
  const yErr = (line: number, fatal = false): Expectation => ({ outcome: "error", file: py, line, fatal });
  yamlLine(2, "currency: usd", yErr(2), "currency in lower case");
  yamlLine(2, "currency: [USD]", yErr(2), "currency as a list");
  yamlLine(3, "as_of: 2024-13-01", yErr(3), "as_of month 13");
  yamlLine(3, "as_of: 0000-01-01", yErr(3), "as_of year 0000");
  yamlLine(4, "forecast_months: 0", yErr(4), "forecast_months 0");
  yamlLine(4, "forecast_months: 121", yErr(4), "forecast_months 121");
  yamlLine(4, "forecast_months: 1.5", yErr(4), "forecast_months 1.5");
  yamlLine(4, "forecast_months: twelve", yErr(4), "forecast_months as text");
  yamlLine(5, "escalation: { electricity: 300% }", yErr(5), "escalation 300 %");
  yamlLine(5, "escalation: { coal: 3% }", yErr(5), "escalation of an unknown commodity");
  yamlLine(5, "escalation: 3%", yErr(5), "escalation not a mapping");
  yamlLine(6, "tolerances: { usage_pct: -1 }", yErr(6), "negative tolerance");
  yamlLine(6, "tolerances: { usage_pct: 1e308 }", yErr(6), "tolerance 1e308");
  yamlLine(6, "tolerances: { colour: 1 }", yErr(6), "unknown tolerance");
  yamlLine(7, "degree_day_base: { heating: 1e308 }", yErr(7), "degree-day base 1e308");
  yamlLine(7, "degree_day_base: { unit: K }", yErr(7), "degree-day unit K");
  yamlLine(8, "base_path: 5", yErr(8), "base_path a number");
  yamlLine(9, "interval_timestamp: middle", yErr(9), "interval_timestamp middle");
  yamlLine(10, "weather_max_gap_hours: 1e308", yErr(10), "weather_max_gap_hours 1e308");
  yamlLine(10, "weather_max_gap_hours: -1", yErr(10), "weather_max_gap_hours negative");
  yamlLine(10, "colour: red", { outcome: "warning", file: py, line: 10 }, "unknown setting");
  yamlLine(1, "name: ''", yErr(1, true), "empty name");
  yamlLine(1, "# no name", yErr(1, true), "no name at all");
  yamlLine(2, "\tcurrency: USD", yErr(2, true), "tab indentation");
  const appendYaml = (name: string, tail: string, expect: Expectation): void =>
    add(`portfolio.yaml: ${name}`, expect, (fs) => put(fs, py, `${text(fs, py).trimEnd()}\n${tail}\n`));
  appendYaml("cleaning.spike.half_window_hours 1e308", "cleaning: { spike: { half_window_hours: 1e308 } }", yErr(11));
  appendYaml("cleaning sigmas .nan", "cleaning: { spike: { sigmas: .nan } }", yErr(11));
  appendYaml("cleaning unknown detector", "cleaning: { colour: { x: 1 } }", yErr(11));
  appendYaml("cleaning min_run_intervals 2.5", "cleaning: { zero_run: { min_run_intervals: 2.5 } }", yErr(11));
  appendYaml("cleaning usual_share 5", "cleaning: { zero_run: { usual_share: 5 } }", yErr(11));
  appendYaml("alignment offset 99 h", "alignment: { offsets: { E-100: 99 } }", yErr(11));
  appendYaml("alignment auto maybe", "alignment: { auto: maybe }", yErr(11));
  appendYaml("duplicate key", "name: Again", yErr(11, true));
  appendYaml("brackets nested 100,000 deep", `cleaning: ${"[".repeat(100_000)}${"]".repeat(100_000)}`, yErr(11, true));
  appendYaml("indentation 400 levels deep", Array.from({ length: 400 }, (_, i) => `${" ".repeat(i)}k${i}:`).join("\n"), { outcome: "error", file: py, line: 268, fatal: true });
  appendYaml("alias bomb (billion laughs) under an unknown key", aliasBomb(9), { outcome: "warning", file: py, line: 11 });
  appendYaml("more than 100 aliases", `anchors: &a 1\nmany: [${Array(150).fill("*a").join(", ")}]`, yErr(12, true));
  add("portfolio.yaml: 2 MB file", yErr(0, true), (fs) => put(fs, py, `${text(fs, py)}# ${"x".repeat(2_000_000)}\n`));
  add("portfolio.yaml: empty", yErr(1, true), (fs) => put(fs, py, ""));
  add("portfolio.yaml: a folder", yErr(0, true), (fs) => fs.set(py, { kind: "dir" }));
  add("portfolio.yaml: a FIFO", yErr(0, true), (fs) => fs.set(py, { kind: "fifo" }));
  add("portfolio.yaml: missing", yErr(0, true), (fs) => fs.delete(py));
  add("portfolio.yaml: currency EUR while tariffs are in USD", { outcome: "error", file: "tariffs/fen-gs.yaml", line: 5 }, (fs) => setLine(fs, py, 2, () => "currency: EUR"));

  // tariffs/fen-gs.yaml (lines: 1 id, 3 commodity, 4 usage_unit, 5 currency, 6 versions:, 7 - from,
  // 8 charges:, 9 - label Customer charge, 10 fixed, 11 - label Energy, 12 energy).
  const tf = "tariffs/fen-gs.yaml";
  const tErr = (line: number): Expectation => ({ outcome: "error", file: tf, line });
  const tLine = (n: number, value: string, line: number, name: string): void => add(`${tf}: ${name}`, tErr(line), (fs) => setLine(fs, tf, n, () => value));
  tLine(1, "id: [a, b]", 1, "id as a list");
  tLine(3, "commodity: coal", 3, "unknown commodity");
  tLine(3, "commodity: 7", 3, "commodity as a number");
  tLine(4, "usage_unit: parsec", 4, "unknown usage_unit");
  tLine(5, "currency: usd", 5, "currency in lower case");
  tLine(5, "currency: EUR", 5, "currency other than the portfolio's");
  const tTail = (value: string, name: string): void =>
    add(`${tf}: ${name}`, tErr(6), (fs) => put(fs, tf, `${text(fs, tf).split("\n").slice(0, 5).join("\n")}\n${value}\n`));
  tTail("versions: {}", "versions as a mapping");
  tTail("versions: []", "versions empty");
  tTail("versions: 2024-01-01", "versions as a date");
  tLine(7, "  - from: 2024-13-01", 7, "from month 13");
  tLine(7, "  - from: yesterday", 7, "from as text");
  tLine(8, "    charges: 5", 8, "charges as a number");
  tLine(10, "        fixed: abc", 10, "fixed as text");
  tLine(10, "        fixed: 1e308", 10, "fixed 1e308");
  tLine(10, "        fixed: .inf", 10, "fixed infinite");
  tLine(10, "        fixed: [1]", 10, "fixed as a list");
  tLine(12, "        energy: 1e308", 12, "energy rate 1e308");
  tLine(12, "        energy: -1e10", 12, "energy rate -1e10");
  tLine(12, "        energy: { peak: 0.2 }", 12, "rates per period without periods");
  tLine(11, "      - label: Customer charge", 11, "the same label twice");
  tLine(10, "        fixed: 25.00\n        colour: red", 11, "unknown key in a charge");
  tLine(2, "name: x\ncolour: red", 3, "unknown top-level key");
  tLine(7, "  - from: 2024-01-01\n    inherit: true", 8, "inherit on the first version");
  const appendCharge = (name: string, yaml: string, line: number): void =>
    add(`${tf}: ${name}`, tErr(line), (fs) => put(fs, tf, `${text(fs, tf).trimEnd()}\n${yaml}\n`));
  appendCharge("percent 1e308", "      - label: Tax\n        percent: 1e308", 14);
  appendCharge("percent of a line below", "      - label: Tax\n        percent: 5\n        of: [Later]", 15);
  appendCharge("demand window_minutes 7", "      - label: Demand\n        demand: 10\n        window_minutes: 7", 15);
  appendCharge("ratchet percent 200", "      - label: Demand\n        demand: 10\n        ratchet: { percent: 200, months: 11 }", 15);
  appendCharge("blocks out of order", "      - label: Blocks\n        blocks:\n          - { up_to: 500, rate: 0.1 }\n          - { up_to: 100, rate: 0.1 }\n          - { rate: 0.1 }", 16);
  appendCharge("a charge of two kinds", "      - label: Both\n        fixed: 1\n        energy: 0.1", 13);
  appendCharge("versions out of order", "  - from: 2023-01-01\n    charges:\n      - label: Customer charge\n        fixed: 20", 13);
  add(`${tf}: duplicate tariff id in a second file`, { outcome: "error", file: "tariffs/fen-gs2.yaml", line: 1 }, (fs) => fs.set("tariffs/fen-gs2.yaml", fs.get(tf)!));
  add(`${tf}: alias bomb`, tErr(13), (fs) => put(fs, tf, `${text(fs, tf).trimEnd()}\n${aliasBomb(9)}\n`));
  add(`${tf}: brackets nested 100,000 deep`, tErr(13), (fs) => put(fs, tf, `${text(fs, tf).trimEnd()}\nx: ${"[".repeat(100_000)}${"]".repeat(100_000)}\n`));
  add(`${tf}: empty`, tErr(0), (fs) => put(fs, tf, ""));
  add(`${tf}: tab indentation`, tErr(9), (fs) => setLine(fs, tf, 9, (l) => `\t${l}`));
  add(`${tf}: binary garbage`, { outcome: "error", file: tf, line: 1 }, (fs) => put(fs, tf, garbage(2000)));
  add(`${tf}: a folder named like a tariff`, tErr(0), (fs) => fs.set(tf, { kind: "dir" }));
  add(`${tf}: a FIFO`, tErr(0), (fs) => fs.set(tf, { kind: "fifo" }));
  add(`${tf}: symbolic link outside the folder`, tErr(0), (fs) => fs.set(tf, { kind: "symlink", target: "outside.yaml", outside: true }));
  add(`${tf}: symbolic link inside the folder`, { outcome: "valid" }, (fs) => {
    fs.set("store/fen-gs.yaml", fs.get(tf)!);
    fs.set(tf, { kind: "symlink", target: "store/fen-gs.yaml" });
  });
  add(`${tf}: 2 MB file`, tErr(0), (fs) => put(fs, tf, `${text(fs, tf)}# ${"x".repeat(2_000_000)}\n`));

  // Folders.
  add("intervals/ is a file, not a folder", { outcome: "error", file: "intervals/", line: 0 }, (fs) => {
    fs.delete("intervals/E-100-2024.csv");
    put(fs, "intervals", "not a folder");
  });
  return cases;
}

/** "Billion laughs": 10 anchors, each a list of 10 aliases of the previous one. */
function aliasBomb(levels: number): string {
  const out = ['lol0: &lol0 ["lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol"]'];
  for (let i = 1; i <= levels; i++) out.push(`lol${i}: &lol${i} [${Array(10).fill(`*lol${i - 1}`).join(", ")}]`);
  return out.join("\n");
}
