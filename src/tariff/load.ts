/**
 * Reads a tariff file (format: docs/writing-a-tariff.md) into a validated `Tariff`.
 * Strict by design: an unknown key, a rate for an undefined period, blocks out of order or
 * versions out of order are errors with file:line:column and a hint, never guesses.
 */
import { isMap, isScalar, LineCounter, parseDocument, type Node } from "yaml";
import type { InputIssue } from "../core/issues.ts";
import { COMMODITIES, type Commodity } from "../domain/types.ts";
import { isIsoDate } from "./dates.ts";
import type { Block, Charge, HolidayRule, HourRange, Period, RateSpec, Season, Tariff, TariffVersion } from "./model.ts";
import { canonicalUnit, DEFAULT_HEAT_CONTENT_THERM_PER_CCF, UNITS_BY_COMMODITY } from "./units.ts";
import {
  Checker,
  didYouMean,
  readBool,
  readMap,
  readNamedMap,
  readNumber,
  readSeq,
  readString,
  where,
  type AnyNode,
  type Field,
} from "./yaml-check.ts";

/** Label of the line the minimum bill adds; percent lines may name it in `of`. */
export const MINIMUM_BILL_LABEL = "Minimum bill adjustment";

const TOP_KEYS = ["id", "name", "commodity", "usage_unit", "currency", "heat_content", "versions"];
const VERSION_KEYS = ["from", "inherit", "seasons", "holidays", "periods", "charges", "charges_override", "minimum_bill"];
const PERIOD_KEYS = ["season", "days", "hours"];
const KIND_KEYS = ["fixed", "blocks", "energy", "demand", "power_factor", "percent"] as const;
const EXTRA_KEYS: Record<(typeof KIND_KEYS)[number], string[]> = {
  fixed: [],
  blocks: ["scale_blocks_by_days"],
  energy: [],
  demand: ["window_minutes", "ratchet", "minimum_kw"],
  power_factor: [],
  percent: ["of"],
};
const ALL_CHARGE_KEYS = ["label", ...KIND_KEYS, ...Object.values(EXTRA_KEYS).flat()];
const MONTHS = ["jan", "feb", "mar", "apr", "may", "jun", "jul", "aug", "sep", "oct", "nov", "dec"];
const MONTH_NAMES = ["january", "february", "march", "april", "may", "june", "july", "august", "september", "october", "november", "december"];

/** A charge as read, with the nodes later checks point at. */
interface ParsedCharge {
  charge: Charge;
  labelNode: Node;
  /** Period names used by a per-period rate, with their key nodes. */
  rateNames: Field[];
  rateNode: Node;
  /** Labels named by a percent line's `of`, with their nodes. */
  ofNames: { name: string; node: Node }[];
}

interface ParsedPeriod {
  period: Period;
  keyNode: Node;
  seasonNode: AnyNode;
}

interface RawVersion {
  node: AnyNode;
  from: string | null;
  fromNode: AnyNode;
  inherit: boolean;
  inheritNode: AnyNode;
  seasons?: Season[];
  seasonsNode?: AnyNode;
  holidays?: HolidayRule;
  periods?: ParsedPeriod[];
  periodsNode?: AnyNode;
  charges?: ParsedCharge[];
  chargesNode?: AnyNode;
  overrides?: ParsedCharge[];
  minimumBill?: number | null;
}

interface ResolvedVersion {
  raw: RawVersion;
  seasons: Season[];
  holidays: HolidayRule;
  periods: ParsedPeriod[];
  periodsNode: AnyNode;
  charges: { parsed: ParsedCharge; inherited: boolean }[];
  minimumBill: number | null;
}

/**
 * Parses and validates a tariff file.
 *
 * @param text file contents (YAML)
 * @param file path as the user gave it, used in every issue
 * @returns the tariff (null when there is any error) and every issue found, with positions
 * @example loadTariff("id: x\n…", "tariffs/x.yaml").issues[0] // { line: 3, column: 5, message: "…" }
 */
export function loadTariff(text: string, file: string): { tariff: Tariff | null; issues: InputIssue[] } {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, prettyErrors: false, uniqueKeys: true });
  const c = new Checker(file, lineCounter);
  if (doc.errors.length > 0) {
    for (const e of doc.errors) {
      const p = e.linePos?.[0] ?? lineCounter.linePos(e.pos[0]);
      c.issues.push({
        file,
        line: p.line,
        column: p.col,
        severity: "error",
        message: e.code === "DUPLICATE_KEY" ? `key '${(/^[^:\n]*/.exec(text.slice(e.pos[0]))?.[0] ?? "").trim()}' appears twice in the same mapping` : `YAML syntax: ${e.message.split("\n")[0]}`,
        hint: e.code === "DUPLICATE_KEY" ? "keep one of them" : "check indentation (spaces, not tabs), colons and quotes near this position",
      });
    }
    return { tariff: null, issues: [...c.issues].sort((a, b) => a.line - b.line || a.column - b.column) };
  }
  if (doc.contents === null) {
    c.issues.push({ file, line: 0, column: 0, severity: "error", message: "the tariff file is empty", hint: "start with id:, commodity:, usage_unit: and versions:" });
    return { tariff: null, issues: c.issues };
  }
  const tariff = readTariff(c, doc.contents as Node, file);
  // Report in file order, as an editor would list them.
  const issues = [...c.issues].sort((a, b) => a.line - b.line || a.column - b.column);
  return { tariff: c.failed ? null : tariff, issues };
}

function readTariff(c: Checker, root: Node, file: string): Tariff | null {
  const top = readMap(c, root, TOP_KEYS, "the tariff");
  if (!top) return null;
  const need = (name: string): Field | null => {
    const f = top.get(name);
    if (!f) c.error(root, `missing required key '${name}'`, `a tariff needs ${["id", "commodity", "usage_unit", "versions"].join(", ")}`);
    return f ?? null;
  };
  const idF = need("id");
  const commodityF = need("commodity");
  const unitF = need("usage_unit");
  const versionsF = need("versions");
  const id = idF ? readString(c, idF, "id") : null;
  const nameF = top.get("name");
  const name = nameF ? readString(c, nameF, "name") : id;

  let commodity: Commodity | null = null;
  if (commodityF) {
    const s = readString(c, commodityF, "commodity", `one of ${COMMODITIES.join(", ")}`);
    if (s !== null) {
      if ((COMMODITIES as readonly string[]).includes(s)) commodity = s as Commodity;
      else c.error(where(commodityF), `commodity '${s}' is not known`, `${didYouMean(s, COMMODITIES)}use one of ${COMMODITIES.join(", ")}`);
    }
  }
  let usageUnit: string | null = null;
  if (unitF && commodity) {
    const s = readString(c, unitF, "usage_unit");
    if (s !== null) {
      usageUnit = canonicalUnit(commodity, s);
      if (usageUnit === null) {
        c.error(where(unitF), `usage_unit '${s}' is not a unit for ${commodity}`, `use one of ${UNITS_BY_COMMODITY[commodity].join(", ")}`);
      }
    }
  }
  let currency = "USD";
  const curF = top.get("currency");
  if (curF) {
    const s = readString(c, curF, "currency");
    if (s !== null) {
      if (/^[A-Z]{3}$/.test(s)) currency = s;
      else c.error(where(curF), `currency '${s}' is not an ISO 4217 code`, "three capital letters, e.g. USD");
    }
  }
  let heat = DEFAULT_HEAT_CONTENT_THERM_PER_CCF;
  const heatF = top.get("heat_content");
  if (heatF) {
    if (commodity !== null && commodity !== "gas") {
      // The format's own example carries it on an electricity tariff, so it is not an error.
      c.warning(heatF.key, `heat_content is used for gas only; it has no effect on this ${commodity} tariff`, "remove heat_content");
    }
    {
      const v = readNumber(c, heatF, "heat_content (therm per ccf)", { above: 0 });
      if (v !== null) {
        heat = v;
        if (v < 0.8 || v > 1.3) c.warning(where(heatF), `heat_content ${v} therm/ccf is far from the usual 0.95–1.10`, "check the unit: therm per ccf");
      }
    }
  }

  const rawVersions: RawVersion[] = [];
  if (versionsF) {
    const items = readSeq(c, versionsF.value, "versions", versionsF.key);
    if (items && items.length === 0) c.error(versionsF.key, "versions is empty", "add at least one version with from: and charges:");
    for (const item of items ?? []) rawVersions.push(readVersion(c, item));
  }
  checkVersionOrder(c, rawVersions);
  const resolved = resolveVersions(c, rawVersions);
  const versions: TariffVersion[] = [];
  resolved.forEach((rv, i) => {
    checkVersion(c, rv, commodity);
    const next = rawVersions[i + 1]?.from ?? null;
    versions.push({
      from: rv.raw.from ?? "",
      until: next,
      seasons: rv.seasons,
      holidays: rv.holidays,
      periods: rv.periods.map((p) => p.period),
      charges: rv.charges.map((ch) => ch.parsed.charge),
      minimumBill: rv.minimumBill,
      line: c.pos(rv.raw.node).line,
    });
  });
  if (c.failed || !id || !commodity || !usageUnit) return null;
  return {
    id,
    name: name ?? id,
    commodity,
    usageUnit,
    currency,
    heatContentThermPerCcf: heat,
    heatContentStated: heatF !== undefined,
    versions,
    file,
  };
}

function readVersion(c: Checker, node: AnyNode): RawVersion {
  const raw: RawVersion = { node, from: null, fromNode: node, inherit: false, inheritNode: null };
  const m = readMap(c, node, VERSION_KEYS, "a version");
  if (!m) return raw;
  const fromF = m.get("from");
  if (!fromF) {
    c.error(node, "a version needs 'from' (the first day it is in force)", "e.g. from: 2024-01-01");
  } else {
    raw.fromNode = where(fromF);
    const s = isScalar(fromF.value) ? String(fromF.value.value) : null;
    if (s === null || !isIsoDate(s)) c.error(where(fromF), `from must be a date written YYYY-MM-DD, got ${s === null ? "nothing" : `'${s}'`}`);
    else raw.from = s;
  }
  const inhF = m.get("inherit");
  if (inhF) {
    raw.inherit = readBool(c, inhF, "inherit") ?? false;
    raw.inheritNode = inhF.key;
  }
  const seasonsF = m.get("seasons");
  if (seasonsF) {
    raw.seasons = readSeasons(c, seasonsF);
    raw.seasonsNode = seasonsF.key;
  }
  const holF = m.get("holidays");
  if (holF) raw.holidays = readHolidays(c, holF);
  const periodsF = m.get("periods");
  if (periodsF) {
    raw.periods = readPeriods(c, periodsF);
    raw.periodsNode = periodsF.key;
  }
  const chargesF = m.get("charges");
  const overF = m.get("charges_override");
  if (chargesF) {
    raw.charges = readCharges(c, chargesF, "charges");
    raw.chargesNode = chargesF.key;
  }
  if (overF) {
    raw.overrides = readCharges(c, overF, "charges_override");
    if (!raw.inherit) c.error(overF.key, "charges_override needs inherit: true", "add inherit: true, or list every charge under charges:");
    if (chargesF) c.error(overF.key, "a version cannot have both charges and charges_override", "use charges: to replace all charges, or charges_override: to change some");
  }
  if (!chargesF && !raw.inherit) c.error(node, "a version needs charges (or inherit: true to start from the previous version)");
  const minF = m.get("minimum_bill");
  if (minF) raw.minimumBill = readNumber(c, minF, "minimum_bill", { min: 0 });
  return raw;
}

function parseMonth(s: string): number | null {
  const t = s.trim().toLowerCase();
  const i = MONTHS.indexOf(t);
  if (i >= 0) return i + 1;
  const j = MONTH_NAMES.indexOf(t);
  return j >= 0 ? j + 1 : null;
}

/** Months of "Jun-Sep" (wrapping the year end, e.g. "Oct-May") or "Jul". */
function parseMonthRange(s: string): number[] | null {
  const parts = s.split("-");
  if (parts.length === 1) {
    const m = parseMonth(parts[0]);
    return m === null ? null : [m];
  }
  if (parts.length !== 2) return null;
  const a = parseMonth(parts[0]);
  const b = parseMonth(parts[1]);
  if (a === null || b === null) return null;
  const out: number[] = [];
  for (let m = a; ; m = (m % 12) + 1) {
    out.push(m);
    if (m === b) break;
  }
  return out;
}

function readSeasons(c: Checker, f: Field): Season[] {
  const fields = readNamedMap(c, f.value, "seasons", f.key);
  const seasons: Season[] = [];
  const owner = new Map<number, string>();
  for (const sf of fields ?? []) {
    const texts: { s: string; node: AnyNode }[] = [];
    const seq = sf.value && "items" in sf.value ? readSeq(c, sf.value, `season '${sf.name}'`) : null;
    if (seq) {
      for (const it of seq) texts.push({ s: isScalar(it) ? String(it.value) : "", node: it });
    } else if (isScalar(sf.value) && typeof sf.value.value === "string") {
      texts.push({ s: sf.value.value, node: sf.value });
    } else if (!seq) {
      c.error(where(sf), `season '${sf.name}' must be a month range such as Jun-Sep`);
    }
    const months: number[] = [];
    for (const { s, node } of texts) {
      const ms = parseMonthRange(s);
      if (ms === null) {
        c.error(node, `season '${sf.name}': '${s}' is not a month or month range`, "write three-letter months, e.g. Jun-Sep or Oct-May (wraps the year end)");
        continue;
      }
      for (const m of ms) {
        const prev = owner.get(m);
        if (prev !== undefined) {
          c.error(node, `season '${sf.name}' includes ${MONTHS[m - 1][0].toUpperCase()}${MONTHS[m - 1].slice(1)}, which is already in season '${prev}'`, "each month may belong to one season only");
        } else {
          owner.set(m, sf.name);
          months.push(m);
        }
      }
    }
    seasons.push({ name: sf.name, months: months.sort((a, b) => a - b) });
  }
  return seasons;
}

function readHolidays(c: Checker, f: Field): HolidayRule {
  if (isScalar(f.value) && f.value.value === "us-federal") return { kind: "us-federal" };
  if (f.value && "items" in f.value) {
    const dates: string[] = [];
    for (const it of readSeq(c, f.value, "holidays") ?? []) {
      const s = isScalar(it) ? String(it.value) : "";
      if (!isIsoDate(s)) c.error(it ?? f.key, `holiday '${s}' is not a date written YYYY-MM-DD`);
      else dates.push(s);
    }
    return { kind: "dates", dates };
  }
  const got = isScalar(f.value) ? String(f.value.value) : "";
  c.error(where(f), "holidays must be us-federal or a list of dates", `${didYouMean(got, ["us-federal"])}e.g. holidays: us-federal, or holidays: [2025-12-26, 2026-01-02]`);
  return null;
}

const HOURS = /^(\d{1,2}):(\d{2})\s*-\s*(\d{1,2}):(\d{2})$/;

function parseHours(s: string): HourRange | string {
  const m = HOURS.exec(s.trim());
  if (!m) return `'${s}' is not a time range`;
  const [h1, m1, h2, m2] = [Number(m[1]), Number(m[2]), Number(m[3]), Number(m[4])];
  if (h1 > 23 || m1 > 59 || h2 > 24 || m2 > 59 || (h2 === 24 && m2 !== 0)) return `'${s}' has an impossible time`;
  const startMin = h1 * 60 + m1;
  const endMin = h2 * 60 + m2;
  if (startMin === endMin % 1440 && !(startMin === 0 && endMin === 1440)) return `'${s}' is empty (start equals end)`;
  return { startMin, endMin };
}

function readPeriods(c: Checker, f: Field): ParsedPeriod[] {
  const out: ParsedPeriod[] = [];
  for (const pf of readNamedMap(c, f.value, "periods", f.key) ?? []) {
    // `off-peak:` with nothing after it reads as null; treat it like `{}`, as a person means it.
    const empty = pf.value == null || (isScalar(pf.value) && pf.value.value === null);
    const m = empty ? new Map<string, Field>() : readMap(c, pf.value, PERIOD_KEYS, `period '${pf.name}'`, pf.key);
    if (!m) continue;
    const period: Period = { name: pf.name, season: null, days: "all", hours: null, catchAll: m.size === 0 };
    const seasonF = m.get("season");
    if (seasonF) period.season = readString(c, seasonF, `period '${pf.name}': season`);
    const daysF = m.get("days");
    if (daysF) {
      const d = readString(c, daysF, `period '${pf.name}': days`);
      if (d === "weekdays" || d === "weekends" || d === "all") period.days = d;
      else if (d !== null) c.error(where(daysF), `period '${pf.name}': days '${d}' is not known`, `${didYouMean(d, ["weekdays", "weekends", "all"])}use weekdays, weekends or all (holidays count as weekends)`);
    }
    const hoursF = m.get("hours");
    if (hoursF) {
      const items: AnyNode[] = hoursF.value && "items" in hoursF.value ? (readSeq(c, hoursF.value, "hours") ?? []) : [hoursF.value];
      const ranges: HourRange[] = [];
      for (const it of items) {
        const s = isScalar(it) && typeof it.value === "string" ? it.value : null;
        const r = s === null ? "hours must be text such as \"14:00-19:00\"" : parseHours(s);
        if (typeof r === "string") {
          c.error(it ?? hoursF.key, `period '${pf.name}': ${r}`, 'write "HH:MM-HH:MM" in 24-hour time, end exclusive, e.g. "14:00-19:00" or "22:00-06:00"');
        } else {
          ranges.push(r);
        }
      }
      if (items.length === 0) c.error(hoursF.key, `period '${pf.name}': hours is an empty list`, "omit hours for the whole day");
      period.hours = ranges;
    }
    out.push({ period, keyNode: pf.key, seasonNode: seasonF ? where(seasonF) : null });
  }
  return out;
}

function readRate(c: Checker, f: Field, what: string): { rate: RateSpec; names: Field[] } | null {
  if (isScalar(f.value)) {
    const v = readNumber(c, f, what);
    return v === null ? null : { rate: { flat: v }, names: [] };
  }
  const entries = readNamedMap(c, f.value, what, f.key);
  if (!entries) return null;
  if (entries.length === 0) {
    c.error(where(f), `${what} has no rates`, "write one number, or one rate per period like { peak: 0.2, off-peak: 0.1 }");
    return null;
  }
  const byPeriod: Record<string, number> = {};
  for (const e of entries) {
    const v = readNumber(c, e, `${what} for period '${e.name}'`);
    if (v !== null) byPeriod[e.name] = v;
  }
  return { rate: { byPeriod }, names: entries };
}

function readCharges(c: Checker, f: Field, what: string): ParsedCharge[] {
  const out: ParsedCharge[] = [];
  for (const item of readSeq(c, f.value, what, f.key) ?? []) {
    const p = readCharge(c, item);
    if (p) out.push(p);
  }
  return out;
}

/** The charge kind a mapping node names, when it names exactly one. */
function kindOf(node: AnyNode): (typeof KIND_KEYS)[number] | null {
  if (!isMap(node)) return null;
  const keys = node.items.map((p) => (isScalar(p.key) ? String(p.key.value) : ""));
  const kinds = KIND_KEYS.filter((k) => keys.includes(k));
  return kinds.length === 1 ? kinds[0] : null;
}

function readCharge(c: Checker, node: AnyNode): ParsedCharge | null {
  const known = kindOf(node);
  const m = known
    ? readMap(c, node, ["label", known, ...EXTRA_KEYS[known]], `a ${known.replace("_", " ")} charge`)
    : readMap(c, node, ALL_CHARGE_KEYS, "a charge");
  if (!m) return null;
  const labelF = m.get("label");
  if (!labelF) {
    c.error(node, "a charge needs a label", "the label is the line's name on the bill, e.g. label: Customer charge");
    return null;
  }
  const label = readString(c, labelF, "label");
  if (label === null) return null;
  const kinds = KIND_KEYS.filter((k) => m.has(k));
  if (kinds.length !== 1) {
    c.error(
      labelF.key,
      kinds.length === 0 ? `charge '${label}' says nothing to charge` : `charge '${label}' has more than one kind (${kinds.join(", ")})`,
      `give exactly one of ${KIND_KEYS.join(", ")}; split it into separate charges if needed`,
    );
    return null;
  }
  const kind = kinds[0];
  for (const [name, fl] of m) {
    if (name === "label" || name === kind) continue;
    if (!EXTRA_KEYS[kind].includes(name)) {
      c.error(fl.key, `key '${name}' does not apply to a ${kind} charge ('${label}')`, EXTRA_KEYS[kind].length > 0 ? `a ${kind} charge may also have: ${EXTRA_KEYS[kind].join(", ")}` : `a ${kind} charge has only label and ${kind}`);
    }
  }
  const kf = m.get(kind) as Field;
  const base = { labelNode: labelF.value as Node, rateNames: [] as Field[], rateNode: where(kf), ofNames: [] as { name: string; node: Node }[] };
  switch (kind) {
    case "fixed": {
      const v = readNumber(c, kf, `fixed charge '${label}'`);
      return v === null ? null : { ...base, charge: { kind: "fixed", label, amount: v } };
    }
    case "blocks": {
      const blocks = readBlocks(c, kf, label);
      const sf = m.get("scale_blocks_by_days");
      const scale = sf ? readBool(c, sf, "scale_blocks_by_days") : false;
      return blocks === null ? null : { ...base, charge: { kind: "blocks", label, blocks, scaleByDays: scale ?? false } };
    }
    case "energy": {
      const r = readRate(c, kf, `energy rate of '${label}'`);
      return r === null ? null : { ...base, rateNames: r.names, charge: { kind: "energy", label, rate: r.rate } };
    }
    case "demand": {
      const r = readRate(c, kf, `demand rate of '${label}'`);
      const wf = m.get("window_minutes");
      const windowMinutes = wf ? readNumber(c, wf, "window_minutes", { above: 0, integer: true, max: 1440 }) : 15;
      let ratchet = null;
      const rf = m.get("ratchet");
      if (rf) {
        const rm = readMap(c, rf.value, ["percent", "months"], "ratchet", rf.key);
        if (rm) {
          const pf = rm.get("percent");
          const mf = rm.get("months");
          if (!pf || !mf) c.error(where(rf), "ratchet needs percent and months", "e.g. ratchet: { percent: 80, months: 11 }");
          const percent = pf ? readNumber(c, pf, "ratchet percent", { above: 0, max: 100 }) : null;
          const months = mf ? readNumber(c, mf, "ratchet months", { min: 1, integer: true }) : null;
          if (percent !== null && months !== null) ratchet = { percent, months };
        }
        if (r && "byPeriod" in r.rate) c.error(rf.key, `ratchet applies to whole-period demand only ('${label}' is priced per period)`, "put the ratchet on a demand charge with a single rate");
      }
      const mkf = m.get("minimum_kw");
      const minimumKw = mkf ? readNumber(c, mkf, "minimum_kw", { min: 0 }) : null;
      if (r === null || windowMinutes === null) return null;
      return { ...base, rateNames: r.names, charge: { kind: "demand", label, rate: r.rate, windowMinutes, ratchet, minimumKw } };
    }
    case "power_factor": {
      const pm = readMap(c, kf.value, ["target"], "power_factor", kf.key);
      const tf = pm?.get("target");
      if (pm && !tf) c.error(where(kf), "power_factor needs a target", "e.g. power_factor: { target: 0.90 }");
      const target = tf ? readNumber(c, tf, "power factor target", { above: 0, max: 1 }) : null;
      return target === null ? null : { ...base, charge: { kind: "power-factor", label, targetPf: target } };
    }
    case "percent": {
      const pct = readNumber(c, kf, `percent of '${label}'`);
      const of = readOf(c, m.get("of"));
      if (pct === null || of === null) return null;
      return { ...base, ofNames: of === "all" ? [] : of, charge: { kind: "percent", label, percent: pct, of: of === "all" ? "all" : of.map((o) => o.name) } };
    }
  }
}

function readOf(c: Checker, f: Field | undefined): "all" | { name: string; node: Node }[] | null {
  if (!f) return "all";
  if (isScalar(f.value) && typeof f.value.value === "string") {
    return f.value.value === "all" ? "all" : [{ name: f.value.value, node: f.value }];
  }
  if (f.value && "items" in f.value) {
    const out: { name: string; node: Node }[] = [];
    for (const it of readSeq(c, f.value, "of") ?? []) {
      if (isScalar(it) && typeof it.value === "string") out.push({ name: it.value, node: it });
      else c.error(it ?? f.key, "of: each entry must be the label of a line above");
    }
    if (out.length === 0) c.error(where(f), "of is an empty list", "write of: all, or list labels of lines above");
    return out;
  }
  c.error(where(f), "of must be all, a label, or a list of labels");
  return null;
}

function readBlocks(c: Checker, f: Field, label: string): Block[] | null {
  const items = readSeq(c, f.value, `blocks of '${label}'`, f.key);
  if (!items) return null;
  if (items.length === 0) {
    c.error(f.key, `blocks of '${label}' is empty`, "list blocks like { up_to: 500, rate: 0.06 } and end with one without up_to");
    return null;
  }
  const blocks: Block[] = [];
  let prevUpTo = 0;
  let ok = true;
  items.forEach((it, i) => {
    const bm = readMap(c, it, ["up_to", "rate"], `block ${i + 1} of '${label}'`);
    if (!bm) return void (ok = false);
    const rf = bm.get("rate");
    if (!rf) {
      c.error(it, `block ${i + 1} of '${label}' has no rate`);
      ok = false;
    }
    const rate = rf ? readNumber(c, rf, `block ${i + 1} rate`) : null;
    const uf = bm.get("up_to");
    const last = i === items.length - 1;
    let upTo: number | null = null;
    if (uf) {
      upTo = readNumber(c, uf, `block ${i + 1} up_to`, { above: 0 });
      if (upTo !== null && upTo <= prevUpTo) {
        c.error(where(uf), `blocks of '${label}' are out of order: up_to ${upTo} is not above the previous block's ${prevUpTo}`, "list blocks from smallest to largest up_to");
        ok = false;
      }
      if (last) {
        c.error(uf.key, `the last block of '${label}' must not have up_to`, "usage above the last limit needs a rate: end with a block like { rate: 0.04 }");
        ok = false;
      }
      if (upTo !== null) prevUpTo = upTo;
    } else if (!last) {
      c.error(it, `block ${i + 1} of '${label}' has no up_to but is not the last block`, "only the last block is open-ended");
      ok = false;
    }
    if (rate === null) ok = false;
    blocks.push({ upTo: last ? null : upTo, rate: rate ?? 0 });
  });
  return ok ? blocks : null;
}

function checkVersionOrder(c: Checker, versions: RawVersion[]): void {
  for (let i = 1; i < versions.length; i++) {
    const prev = versions[i - 1].from;
    const cur = versions[i].from;
    if (prev !== null && cur !== null && cur <= prev) {
      c.error(
        versions[i].fromNode,
        cur === prev ? `two versions start on ${cur}: they overlap` : `version from ${cur} comes after the version from ${prev}: versions are out of order`,
        "list versions oldest first, each with a later from date",
      );
    }
  }
}

function resolveVersions(c: Checker, raws: RawVersion[]): ResolvedVersion[] {
  const out: ResolvedVersion[] = [];
  raws.forEach((raw, i) => {
    const prev = out[i - 1];
    if (raw.inherit && !prev) {
      c.error(raw.inheritNode, "the first version cannot inherit: there is no earlier version", "remove inherit: true and list its charges");
    }
    const base = raw.inherit && prev ? prev : null;
    let charges: { parsed: ParsedCharge; inherited: boolean }[] = (raw.charges ?? []).map((p) => ({ parsed: p, inherited: false }));
    if (base && !raw.charges) {
      charges = base.charges.map((ch) => ({ parsed: ch.parsed, inherited: true }));
      for (const o of raw.overrides ?? []) {
        const at = charges.findIndex((ch) => ch.parsed.charge.label === o.charge.label);
        if (at >= 0) charges[at] = { parsed: o, inherited: false };
        else charges.push({ parsed: o, inherited: false });
      }
    }
    out.push({
      raw,
      seasons: raw.seasons ?? base?.seasons ?? [],
      holidays: raw.holidays !== undefined ? raw.holidays : (base?.holidays ?? null),
      periods: raw.periods ?? base?.periods ?? [],
      periodsNode: raw.periodsNode ?? base?.periodsNode ?? null,
      charges,
      minimumBill: raw.minimumBill !== undefined ? raw.minimumBill : (base?.minimumBill ?? null),
    });
  });
  return out;
}

/** Cross-checks inside one resolved version: period and season names, catch-all, labels, `of`. */
function checkVersion(c: Checker, v: ResolvedVersion, commodity: Commodity | null): void {
  const seasonNames = v.seasons.map((s) => s.name);
  const periodNames = v.periods.map((p) => p.period.name);
  const from = v.raw.from ?? "?";
  const inheritedNote = (ch: { inherited: boolean }): string => (ch.inherited ? ` (charge inherited by the version from ${from})` : "");

  v.periods.forEach((p, i) => {
    if (p.period.season !== null && !seasonNames.includes(p.period.season)) {
      c.error(
        p.seasonNode ?? p.keyNode,
        `season '${p.period.season}' is not defined${seasonNames.length ? `; defined seasons: ${seasonNames.join(", ")}` : " (this version has no seasons)"}`,
        `${didYouMean(p.period.season, seasonNames)}define it under seasons:`,
      );
    }
    if (p.period.catchAll && i < v.periods.length - 1) {
      c.error(v.periods[i + 1].keyNode, `period '${v.periods[i + 1].period.name}' can never match: catch-all period '${p.period.name}' comes before it`, "periods match first-wins; put the empty {} period last");
    }
  });
  if (v.periods.length > 0 && !v.periods.some((p) => p.period.catchAll)) {
    c.error(v.periodsNode, `periods need a catch-all period for all remaining hours (the version from ${from} has none)`, "add a last period with an empty mapping, e.g. off-peak: {}");
  }

  const labelsAbove: string[] = [];
  let demandAbove = false;
  for (const ch of v.charges) {
    const { charge, labelNode } = ch.parsed;
    if (labelsAbove.includes(charge.label)) {
      c.error(labelNode, `label '${charge.label}' is used twice in the version from ${from}`, "labels identify lines on the bill; make each one unique");
    }
    if ((charge.kind === "energy" || charge.kind === "demand") && "byPeriod" in charge.rate) {
      if (v.periods.length === 0) {
        c.error(ch.parsed.rateNode, `'${charge.label}' has rates per period but the version from ${from} defines no periods${inheritedNote(ch)}`, "define periods: or give a single rate");
      } else {
        for (const nf of ch.parsed.rateNames) {
          if (!periodNames.includes(nf.name)) {
            c.error(nf.key, `period '${nf.name}' is not defined; defined periods: ${periodNames.join(", ")}${inheritedNote(ch)}`, `${didYouMean(nf.name, periodNames)}rates may name only periods of this version`);
          }
        }
        if (charge.kind === "energy") {
          const missing = periodNames.filter((p) => !(p in (charge.rate as { byPeriod: Record<string, number> }).byPeriod));
          if (missing.length > 0) {
            c.error(ch.parsed.rateNode, `energy charge '${charge.label}' has no rate for period(s) ${missing.join(", ")}${inheritedNote(ch)}`, "every period's usage must be priced; write 0 for a free period");
          }
        }
      }
    }
    if (charge.kind === "demand") {
      if (commodity !== null && commodity !== "electricity") c.error(labelNode, `demand charge '${charge.label}' needs an electricity tariff (this one is ${commodity})`);
      demandAbove = true;
    }
    if (charge.kind === "power-factor" && !demandAbove) {
      c.error(labelNode, `power factor adjustment '${charge.label}' has no demand charge above it to adjust${inheritedNote(ch)}`, "place it after the demand charges");
    }
    if (charge.kind === "percent") {
      for (const o of ch.parsed.ofNames) {
        const known = v.minimumBill !== null ? [...labelsAbove, MINIMUM_BILL_LABEL] : labelsAbove;
        if (!known.includes(o.name)) {
          c.error(o.node, `'${o.name}' is not a line above '${charge.label}'; lines above: ${known.join(", ") || "none"}${inheritedNote(ch)}`, `${didYouMean(o.name, known)}a percent line applies to lines listed before it, or use of: all`);
        }
      }
    }
    labelsAbove.push(charge.label);
  }
  if (v.charges.length === 0 && !c.failed) c.error(v.raw.node, `the version from ${from} has no charges`);
}
