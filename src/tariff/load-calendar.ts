/**
 * Tariff loader, calendar part: seasons (month ranges that may wrap the year end), holidays
 * (`us-federal` or a list of dates) and time-of-use periods (season, days, hours).
 */
import { isScalar, type Node } from "yaml";
import type { HolidayRule, HourRange, Period, Season } from "./model.ts";
import { Checker, didYouMean, readMap, readNamedMap, readSeq, readString, where, type AnyNode, type Field } from "./yaml-check.ts";
import { isIsoDate } from "../core/time/index.ts";

const PERIOD_KEYS = ["season", "days", "hours"];
const MONTHS = ["jan", "feb", "mar", "apr", "may", "jun", "jul", "aug", "sep", "oct", "nov", "dec"];
const MONTH_NAMES = ["january", "february", "march", "april", "may", "june", "july", "august", "september", "october", "november", "december"];

/** A period as read, with the nodes later checks point at. */
export interface ParsedPeriod {
  period: Period;
  keyNode: Node;
  seasonNode: AnyNode;
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

/** Reads `seasons:`; a month may belong to one season only. */
export function readSeasons(c: Checker, f: Field): Season[] {
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

/** Reads `holidays:` (us-federal or a list of YYYY-MM-DD dates). */
export function readHolidays(c: Checker, f: Field): HolidayRule {
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

/** Reads `periods:` in order, keeping each period's position. */
export function readPeriods(c: Checker, f: Field): ParsedPeriod[] {
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

