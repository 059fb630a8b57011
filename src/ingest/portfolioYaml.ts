/**
 * portfolio.yaml → PortfolioSettings. Pure (text in, settings and issues out). Every key and
 * value is checked; a bad value is an error at its line:column and the default is used, an
 * unknown key is a warning. Only an unparseable file or a missing `name` is fatal.
 */
import { LineCounter, isMap, isScalar, parseDocument, type Node, type Pair } from "yaml";
import type { InputIssue } from "../core/issues.ts";
import type { Commodity, PortfolioSettings } from "../domain/types.ts";
import { COMMODITIES } from "../domain/types.ts";
import { trimId } from "../core/trimId.ts";
import { parseIsoDate } from "./fields.ts";
import { parseCleaningConfig } from "../clean/index.ts";
import { yamlLimitProblem } from "../tariff/index.ts";

/** The node at a key path inside a YAML mapping (for placing an error), or null. */
function nodeAtPath(node: Node | null | undefined, path: string[]): Node | null {
  let current: Node | null | undefined = node;
  for (const key of path) {
    if (!isMap(current)) return null;
    const pair = (current.items as Pair<Node, Node | null>[]).find((p) => isScalar(p.key) && String(p.key.value) === key);
    if (!pair) return null;
    current = pair.value ?? pair.key;
  }
  return current ?? null;
}

export const DEFAULT_SETTINGS: Omit<PortfolioSettings, "name"> = {
  currency: "USD",
  asOf: null,
  forecastMonths: 12,
  escalation: { electricity: 0, gas: 0, water: 0 },
  escalationStated: false,
  tolerances: { usagePct: 2, demandPct: 3, costAbs: 1, costPct: 0.5 },
  degreeDayBase: { heating: 18, cooling: 18, unit: "C" },
  basePath: "/",
  intervalTimestamp: "start",
  weatherMaxGapHours: 6,
  cleaning: {},
  alignment: { offsetsHours: {}, auto: false },
};

const TOP_KEYS = [
  "name", "currency", "as_of", "forecast_months", "escalation", "tolerances",
  "degree_day_base", "base_path", "interval_timestamp", "weather_max_gap_hours", "cleaning", "alignment", "contacts",
];

/** Longest contact line, in characters: one line on a page, not a letter. */
const MAX_CONTACT_CHARS = 300;

export interface SettingsResult {
  settings: PortfolioSettings | null;
  issues: InputIssue[];
  fatal: boolean;
  /** Line and column of each building id under `contacts:`, so ingest can place a warning on an unknown id. */
  contactPositions?: Record<string, { line: number; column: number }>;
}

/**
 * Normalizes a URL prefix to start and end with "/". Examples: "" → "/", "reports" → "/reports/",
 * "/a/b" → "/a/b/", "//x//" → "/x/".
 */
export function normalizeBasePath(raw: string): string {
  const parts = raw.split("/").filter((p) => p !== "");
  return parts.length === 0 ? "/" : `/${parts.join("/")}/`;
}

/**
 * Reads a percentage: `3%` → 0.03, `2.5 %` → 0.025; a bare number is read as percent too
 * (3 → 0.03), like the `_pct` tolerances. Returns null when not a number.
 */
export function parsePercent(value: unknown): number | null {
  if (typeof value === "number" && Number.isFinite(value)) return value / 100;
  if (typeof value !== "string") return null;
  const m = /^\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+))\s*%?\s*$/.exec(value);
  return m ? Number(m[1]) / 100 : null;
}

/** Hours in a leap year: no detector window or run can usefully exceed a year of data. */
const MAX_CLEANING_HOURS = 8784;

/**
 * Limits of one `cleaning:` setting, chosen from its name (the detectors' naming convention):
 * `…Hours` up to a leap year of hours; `…Intervals` whole, up to a leap year of 5-minute
 * intervals (105,408); `…Share` a fraction up to 1; counts (`min_comparisons`,
 * `min_weeks_for_weekly`) whole, up to 1,000; anything else (multiples such as `sigmas`,
 * `negative_levels`, and `min_absolute`, `tolerance` in meter units) up to 1e9, far above any
 * meaningful threshold but small enough to keep arithmetic finite.
 */
function cleaningLimit(field: string): { max: number; whole: boolean; reason: string } {
  if (field.endsWith("Hours")) return { max: MAX_CLEANING_HOURS, whole: false, reason: `hours: at most ${MAX_CLEANING_HOURS} (one leap year); a longer window cannot be evaluated` };
  if (field.endsWith("Intervals")) return { max: 105_408, whole: true, reason: "a whole number of intervals, at most 105,408 (a leap year of 5-minute intervals)" };
  if (field.endsWith("Share")) return { max: 1, whole: false, reason: "a share is a fraction from 0 to 1" };
  if (field === "minComparisons" || field === "minWeeksForWeekly" || field === "minIntervals") return { max: 1000, whole: true, reason: "a whole count, at most 1,000" };
  return { max: 1e9, whole: false, reason: "at most 1e9; larger values only make the detector do nothing" };
}

/** Parses portfolio.yaml text. `file` is the label used in issues. */
export function parsePortfolioYaml(text: string, file: string): SettingsResult {
  const issues: InputIssue[] = [];
  const limit = yamlLimitProblem(text);
  if (limit) return { settings: null, issues: [{ file, line: limit.line, column: limit.column, severity: "error", message: limit.message, hint: limit.hint }], fatal: true };
  const lc = new LineCounter();
  const doc = parseDocument(text, { lineCounter: lc, prettyErrors: false });
  const at = (node: Node | null | undefined): { line: number; column: number } => {
    const offset = node?.range?.[0];
    if (offset === undefined) return { line: 1, column: 1 };
    const p = lc.linePos(offset);
    return { line: p.line, column: p.col };
  };
  const err = (node: Node | null | undefined, message: string, hint?: string): void => {
    issues.push({ file, ...at(node), severity: "error", message, hint });
  };
  const warn = (node: Node | null | undefined, message: string, hint?: string): void => {
    issues.push({ file, ...at(node), severity: "warning", message, hint });
  };

  if (doc.errors.length > 0) {
    for (const e of doc.errors) {
      const pos = e.linePos?.[0] ?? lc.linePos(e.pos[0]);
      issues.push({ file, line: pos?.line ?? 0, column: pos?.col ?? 0, severity: "error",
        message: `YAML syntax: ${e.message.split("\n")[0]}`, hint: "check indentation and that every { [ \" is closed" });
    }
    return { settings: null, issues, fatal: true };
  }
  const root = doc.contents;
  if (!isMap(root)) {
    err(root as Node | null, "portfolio.yaml must be a mapping of settings (key: value)", "start with a line like `name: My Portfolio`");
    return { settings: null, issues, fatal: true };
  }

  const s: PortfolioSettings = structuredClone({ name: "", ...DEFAULT_SETTINGS });
  const contactPositions: Record<string, { line: number; column: number }> = {};
  let named = false;
  for (const pair of root.items as Pair<Node, Node | null>[]) {
    const keyNode = pair.key;
    const key = isScalar(keyNode) ? String(keyNode.value) : "";
    const valNode = pair.value;
    const val = isScalar(valNode) ? valNode.value : valNode?.toJSON();
    switch (key) {
      case "name":
        if (typeof val === "string" && val.trim() !== "") {
          s.name = val;
          named = true;
        } else if (typeof val === "number") {
          s.name = String(valNode && isScalar(valNode) ? (valNode.source ?? val) : val);
          named = true;
        } else err(valNode ?? keyNode, "name must be a non-empty text", "e.g. name: Harbourview Property Group");
        break;
      case "currency":
        if (typeof val === "string" && /^[A-Z]{3}$/.test(val)) s.currency = val;
        else err(valNode ?? keyNode, `currency ${JSON.stringify(val)} is not an ISO 4217 code`, "three capital letters, e.g. USD, EUR, CAD");
        break;
      case "as_of": {
        const parsed = typeof val === "string" ? parseIsoDate(val, "as_of") : null;
        if (parsed?.ok) s.asOf = parsed.value;
        else if (val !== null) err(valNode ?? keyNode, `as_of ${JSON.stringify(val)} is not a YYYY-MM-DD date`, "e.g. as_of: 2025-12-31, or remove it to use the last bill end");
        break;
      }
      case "forecast_months":
        if (typeof val === "number" && Number.isInteger(val) && val >= 1 && val <= 120) s.forecastMonths = val;
        else err(valNode ?? keyNode, `forecast_months ${JSON.stringify(val)} must be a whole number from 1 to 120`, "e.g. forecast_months: 12");
        break;
      case "escalation": {
        if (!isMap(valNode)) {
          err(valNode ?? keyNode, "escalation must be a mapping per commodity", "e.g. escalation: { electricity: 3%, gas: 4% }");
          break;
        }
        for (const p of valNode.items as Pair<Node, Node | null>[]) {
          const c = isScalar(p.key) ? String(p.key.value) : "";
          const raw = isScalar(p.value) ? p.value.value : undefined;
          if (!(COMMODITIES as readonly string[]).includes(c)) {
            err(p.key, `escalation has unknown commodity ${JSON.stringify(c)}`, `use ${COMMODITIES.join(", ")}`);
            continue;
          }
          const frac = parsePercent(raw);
          if (frac === null || Math.abs(frac) > 1) {
            err(p.value ?? p.key, `escalation for ${c} ${JSON.stringify(raw)} is not a percentage`, "write it like 3% (a bare number is read as percent)");
            continue;
          }
          if (typeof raw === "number" && raw !== 0 && Math.abs(raw) < 1) {
            warn(p.value, `escalation for ${c} ${raw} is read as ${raw}% per year`, `write ${raw * 100}% if you meant that`);
          }
          s.escalation[c as Commodity] = frac;
          s.escalationStated = true;
        }
        break;
      }
      case "tolerances": {
        if (!isMap(valNode)) {
          err(valNode ?? keyNode, "tolerances must be a mapping", "e.g. tolerances: { usage_pct: 2, cost_abs: 1.00 }");
          break;
        }
        const names: Record<string, keyof PortfolioSettings["tolerances"]> = {
          usage_pct: "usagePct", demand_pct: "demandPct", cost_abs: "costAbs", cost_pct: "costPct",
        };
        for (const p of valNode.items as Pair<Node, Node | null>[]) {
          const k = isScalar(p.key) ? String(p.key.value) : "";
          const raw = isScalar(p.value) ? p.value.value : undefined;
          const target = names[k];
          if (target === undefined) {
            err(p.key, `tolerances has unknown key ${JSON.stringify(k)}`, `use ${Object.keys(names).join(", ")}`);
            continue;
          }
          const num = k.endsWith("_pct") ? (parsePercent(raw) ?? Number.NaN) * 100 : typeof raw === "number" ? raw : Number.NaN;
          // Percent tolerances above 100 % would accept any bill; money tolerances stay within the
          // bill total limit (1e11) so comparisons remain exact to the cent.
          const maxTol = k.endsWith("_pct") ? 100 : 1e11;
          if (!Number.isFinite(num) || num < 0 || num > maxTol) {
            err(p.value ?? p.key, `tolerances.${k} ${JSON.stringify(raw)} must be a number from 0 to ${maxTol === 100 ? "100" : "1e11"}`, k.endsWith("_pct") ? "in percent, e.g. 2" : "in currency, e.g. 1.00");
            continue;
          }
          s.tolerances[target] = num;
        }
        break;
      }
      case "degree_day_base": {
        if (!isMap(valNode)) {
          err(valNode ?? keyNode, "degree_day_base must be a mapping", "e.g. degree_day_base: { heating: 18, cooling: 18, unit: C }");
          break;
        }
        for (const p of valNode.items as Pair<Node, Node | null>[]) {
          const k = isScalar(p.key) ? String(p.key.value) : "";
          const raw = isScalar(p.value) ? p.value.value : undefined;
          if (k === "heating" || k === "cooling") {
            // A base temperature is an indoor balance point: -50 to 120 covers both °C and °F
            // with room to spare; beyond, every hour would count as heating or cooling.
            if (typeof raw === "number" && Number.isFinite(raw) && raw >= -50 && raw <= 120) s.degreeDayBase[k] = raw;
            else err(p.value ?? p.key, `degree_day_base.${k} ${JSON.stringify(raw)} is not a temperature from -50 to 120`, "a temperature, e.g. 18"); 
          } else if (k === "unit") {
            if (raw === "C" || raw === "F") s.degreeDayBase.unit = raw;
            else err(p.value ?? p.key, `degree_day_base.unit ${JSON.stringify(raw)} must be C or F`);
          } else err(p.key, `degree_day_base has unknown key ${JSON.stringify(k)}`, "use heating, cooling, unit");
        }
        break;
      }
      case "base_path":
        if (typeof val === "string") s.basePath = normalizeBasePath(val);
        else err(valNode ?? keyNode, "base_path must be a text like /reports/", "e.g. base_path: /energy/");
        break;
      case "interval_timestamp":
        if (val === "start" || val === "end") s.intervalTimestamp = val;
        else err(valNode ?? keyNode, `interval_timestamp ${JSON.stringify(val)} must be start or end`, "start (default): the timestamp marks the interval start");
        break;
      case "cleaning": {
        const parsed = parseCleaningConfig(val);
        const config = parsed.config as Record<string, Record<string, number>>;
        for (const problem of parsed.issues) err(nodeAtPath(valNode, problem.path.split(".").slice(1)) ?? keyNode, `${problem.path}: ${problem.message}`);
        // Upper limits (the detectors check only >= 0): a window of 1e308 hours sizes an array
        // and crashed the build (issue 16). Out-of-range values are errors; the default is used.
        for (const [section, fields] of Object.entries(config)) {
          for (const [field, value] of Object.entries(fields)) {
            const limit = cleaningLimit(field);
            const snake = field.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);
            const path = `cleaning.${section.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`)}.${snake}`;
            if (value > limit.max || (limit.whole && !Number.isInteger(value))) {
              err(nodeAtPath(valNode, path.split(".").slice(1)) ?? keyNode, `${path}: ${value} is ${limit.whole && !Number.isInteger(value) ? "not a whole number" : `above the limit of ${limit.max}`}`, limit.reason);
              delete fields[field];
            }
          }
        }
        s.cleaning = config;
        break;
      }
      case "alignment": {
        if (!isMap(valNode)) {
          err(valNode ?? keyNode, "alignment must be a mapping", "e.g. alignment: { auto: false, offsets: { M1: 3 } }");
          break;
        }
        for (const p of valNode.items as Pair<Node, Node | null>[]) {
          const k = isScalar(p.key) ? String(p.key.value) : "";
          if (k === "auto") {
            const raw = isScalar(p.value) ? p.value.value : undefined;
            if (typeof raw === "boolean") s.alignment.auto = raw;
            else err(p.value ?? p.key, `alignment.auto ${JSON.stringify(raw)} must be true or false`);
          } else if (k === "offsets") {
            if (!isMap(p.value)) {
              err(p.value ?? p.key, "alignment.offsets must map meter ids to hours", "e.g. offsets: { M1: 3 } when M1's clock runs 3 h ahead");
              continue;
            }
            for (const q of p.value.items as Pair<Node, Node | null>[]) {
              const meterId = isScalar(q.key) ? trimId(String(q.key.value)) : "";
              const hours = isScalar(q.value) ? q.value.value : undefined;
              if (typeof hours === "number" && Number.isFinite(hours) && Math.abs(hours) <= 14) s.alignment.offsetsHours[meterId] = hours;
              else err(q.value ?? q.key, `alignment offset for ${meterId} ${JSON.stringify(hours)} must be a number of hours from -14 to 14`);
            }
          } else err(p.key, `alignment has unknown key ${JSON.stringify(k)}`, "use auto, offsets");
        }
        break;
      }
      case "contacts": {
        if (!isMap(valNode)) {
          err(valNode ?? keyNode, "contacts must map building ids to a contact line", 'e.g. contacts: { B1: "Building office, 555-0142, office@example.org" }');
          break;
        }
        const contacts: Record<string, string> = {};
        for (const p of valNode.items as Pair<Node, Node | null>[]) {
          const id = isScalar(p.key) ? trimId(String(p.key.value)) : "";
          const raw = isScalar(p.value) ? p.value.value : undefined;
          const text = typeof raw === "string" || typeof raw === "number" ? String(raw).replace(/\s+/g, " ").trim() : "";
          if (id === "") err(p.key, "contacts: a building id is missing", "write the building_id from buildings.csv before the colon");
          else if (text === "") err(p.value ?? p.key, `contact for ${id} must be a line of text`, 'e.g. B1: "Building office, 555-0142"');
          else if (text.length > MAX_CONTACT_CHARS) err(p.value ?? p.key, `contact for ${id} is ${text.length} characters long`, `keep it to one line of at most ${MAX_CONTACT_CHARS} characters`);
          else {
            contacts[id] = text;
            contactPositions[id] = at(p.key);
          }
        }
        s.contacts = contacts;
        break;
      }
      case "weather_max_gap_hours":
        // Capped at one leap year of hours: a longer gap has nothing to interpolate between
        // in the data a build uses, and the cap keeps the fill loop bounded.
        if (typeof val === "number" && Number.isFinite(val) && val >= 0 && val <= MAX_CLEANING_HOURS) s.weatherMaxGapHours = val;
        else err(valNode ?? keyNode, `weather_max_gap_hours ${JSON.stringify(val)} must be a number from 0 to ${MAX_CLEANING_HOURS}`, "e.g. weather_max_gap_hours: 6");
        break;
      default: {
        const near = TOP_KEYS.find((k) => k.replace(/_/g, "") === key.toLowerCase().replace(/[_\s-]/g, ""));
        warn(keyNode, `unknown setting ${JSON.stringify(key)} ignored`, near ? `did you mean ${near}?` : `known settings: ${TOP_KEYS.join(", ")}`);
      }
    }
  }
  if (!named) {
    if (!issues.some((i) => i.message.startsWith("name must"))) {
      issues.push({ file, line: 1, column: 1, severity: "error", message: "portfolio.yaml has no name", hint: "add a line like `name: Harbourview Property Group`" });
    }
    return { settings: null, issues, fatal: true };
  }
  return { settings: s, issues, fatal: false, contactPositions };
}
