/**
 * Tariff loader, versions part: reading one version, checking that versions are in date order,
 * resolving `inherit` + `charges_override` so every version is self-contained, and the
 * cross-checks inside a version (period and season names, catch-all, labels, `of`).
 */
import { isScalar } from "yaml";
import type { Commodity } from "../domain/types.ts";
import { readHolidays, readPeriods, readSeasons, type ParsedPeriod } from "./load-calendar.ts";
import { readCharges, type ParsedCharge } from "./load-charges.ts";
import { MINIMUM_BILL_LABEL, type HolidayRule, type Season } from "./model.ts";
import { Checker, didYouMean, readBool, readMap, readNumber, where, type AnyNode } from "./yaml-check.ts";
import { isIsoDate } from "../core/time/index.ts";

const VERSION_KEYS = ["from", "inherit", "seasons", "holidays", "periods", "charges", "charges_override", "minimum_bill"];

/** A version as written, before inheritance is resolved. */
export interface RawVersion {
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


/** A version with inheritance resolved, still carrying node positions. */
export interface ResolvedVersion {
  raw: RawVersion;
  seasons: Season[];
  holidays: HolidayRule;
  periods: ParsedPeriod[];
  periodsNode: AnyNode;
  charges: { parsed: ParsedCharge; inherited: boolean }[];
  minimumBill: number | null;
}

/** Reads one entry of `versions:`. */
export function readVersion(c: Checker, node: AnyNode): RawVersion {
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

/** Versions must be listed oldest first, with distinct `from` dates. */
export function checkVersionOrder(c: Checker, versions: RawVersion[]): void {
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

/** Applies `inherit` and `charges_override`, so each version stands on its own. */
export function resolveVersions(c: Checker, raws: RawVersion[]): ResolvedVersion[] {
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
export function checkVersion(c: Checker, v: ResolvedVersion, commodity: Commodity | null): void {
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

  // A Set, not an array: `includes` per charge made loading quadratic (32k charges took 54 s).
  const labelsAbove = new Set<string>();
  let demandAbove = false;
  for (const ch of v.charges) {
    const { charge, labelNode } = ch.parsed;
    if (labelsAbove.has(charge.label)) {
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
        const isKnown = labelsAbove.has(o.name) || (v.minimumBill !== null && o.name === MINIMUM_BILL_LABEL);
        if (!isKnown) {
          const known = v.minimumBill !== null ? [...labelsAbove, MINIMUM_BILL_LABEL] : [...labelsAbove];
          const shown = known.length > 20 ? `${known.slice(0, 20).join(", ")} and ${known.length - 20} more` : known.join(", ");
          c.error(o.node, `'${o.name}' is not a line above '${charge.label}'; lines above: ${shown || "none"}${inheritedNote(ch)}`, `${didYouMean(o.name, known.length > 200 ? [] : known)}a percent line applies to lines listed before it, or use of: all`);
        }
      }
    }
    labelsAbove.add(charge.label);
  }
  if (v.charges.length === 0 && !c.failed) c.error(v.raw.node, `the version from ${from} has no charges`);
}

