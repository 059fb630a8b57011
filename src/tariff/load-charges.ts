/**
 * Tariff loader, charges part: one reader per charge kind (fixed, blocks, energy, demand,
 * power_factor, percent), each keeping the YAML nodes that later cross-checks point at.
 */
import { isMap, isScalar, type Node } from "yaml";
import type { Block, Charge, RateSpec } from "./model.ts";
import { Checker, readBool, readMap, readNamedMap, readNumber, readSeq, readString, where, type AnyNode, type Field } from "./yaml-check.ts";

/** Demand windows in minutes that a meter can measure (see window_minutes in the tariff format). */
const DEMAND_WINDOWS: readonly number[] = [5, 10, 15, 30, 60];

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

/** A charge as read, with the nodes later checks point at. */
export interface ParsedCharge {
  charge: Charge;
  labelNode: Node;
  /** Period names used by a per-period rate, with their key nodes. */
  rateNames: Field[];
  rateNode: Node;
  /** Labels named by a percent line's `of`, with their nodes. */
  ofNames: { name: string; node: Node }[];
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

/** Reads a list of charges (`charges:` or `charges_override:`). */
export function readCharges(c: Checker, f: Field, what: string): ParsedCharge[] {
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
      let windowMinutes = wf ? readNumber(c, wf, "window_minutes", { above: 0, integer: true, max: 1440 }) : 15;
      // Demand is the average over a fixed metering window; utilities use 5, 10, 15, 30 or 60
      // minutes, and a window must be a whole number of interval readings (5-minute grid or
      // coarser), so 7 cannot be measured (issue 16: it was accepted silently).
      if (wf && windowMinutes !== null && !DEMAND_WINDOWS.includes(windowMinutes)) {
        c.error(where(wf), `window_minutes ${windowMinutes} is not a demand window`, `use one of ${DEMAND_WINDOWS.join(", ")}`);
        windowMinutes = null;
      }
      let ratchet = null;
      const rf = m.get("ratchet");
      if (rf) {
        const rm = readMap(c, rf.value, ["percent", "months"], "ratchet", rf.key);
        if (rm) {
          const pf = rm.get("percent");
          const mf = rm.get("months");
          if (!pf || !mf) c.error(where(rf), "ratchet needs percent and months", "e.g. ratchet: { percent: 80, months: 11 }");
          const percent = pf ? readNumber(c, pf, "ratchet percent", { above: 0, max: 100 }) : null;
          const months = mf ? readNumber(c, mf, "ratchet months", { min: 1, max: 36, integer: true }) /* ratchets look back at most a few years */ : null;
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
      // A tax, surcharge or discount is a share of the lines it applies to: from -100 % (all
      // waived) to 100 % (doubled). Beyond is a typing error (e.g. 1e308 made every bill NaN).
      const pct = readNumber(c, kf, `percent of '${label}'`, { min: -100, max: 100 });
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

