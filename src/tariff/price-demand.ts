/**
 * Demand charges for one version: whole-period demand (interval data, else the billed demand)
 * with ratchet and minimum, and demand inside time-of-use periods (exact from interval data,
 * estimated from a load shape, or the billed demand as an upper bound).
 */
import type { ComputedLine, LinePart, LineStatus } from "./types.ts";
import type { Charge } from "./model.ts";
import { billingDemandKw, maxWindowDemandKw } from "./demand.ts";
import { groupedNumber } from "./format.ts";
import { line } from "./lines.ts";
import { agreesWithinRounding, type VersionState } from "./version-state.ts";
import { sumAmounts } from "../core/money.ts";

const fmt = groupedNumber;

/** Prices one demand charge; `billingKw` is set for whole-period demand. */
export function priceDemand(st: VersionState, charge: Extract<Charge, { kind: "demand" }>, prev: readonly number[]): { line: ComputedLine; billingKw: number | null } {
  const { ctx, version } = st;
  const iv = ctx.intervals;
  const req = ctx.req;
  const windowText = `${charge.windowMinutes}-minute`;
  if ("flat" in charge.rate) {
    let measured: number | null = null;
    let status: LineStatus = "exact";
    let source: string;
    if (iv && iv.kwh && iv.startMs.length > 0) {
      const d = st.windowDemand(charge.windowMinutes);
      measured = d.kw;
      source = ctx.detail ? `highest ${d.intervalsPerWindow * iv.intervalMinutes}-minute average from interval data` : "";
      // Shape only: the bill's demand governs; the meter's more precise figure is used only when it is the same reading.
      const scaled = billedDemandScale(st);
      if (scaled !== null && scaled.scale !== 1) {
        const meterKw = measured;
        measured = charge.windowMinutes === scaled.windowMinutes || meterKw === null ? req.demandKw! : meterKw * scaled.scale;
        source = ctx.detail ? `billed maximum demand ${fmt(req.demandKw!)} kW (the meter's highest ${scaled.windowMinutes}-minute average was ${fmt(scaled.meterKw)} kW)` : "";
      }
    } else {
      source = "";
    }
    if (measured === null && req.demandKw != null) {
      measured = req.demandKw;
      source = "billed maximum demand";
    }
    if (measured === null) {
      status = "needs-interval-data";
      source = "no demand on the bill and no interval data: measured demand taken as 0";
    }
    const b = billingDemandKw(measured ?? 0, prev, charge.ratchet, charge.minimumKw);
    if (!ctx.detail) return { line: line(charge, b.kw, "kW", charge.rate.flat, b.kw * charge.rate.flat, null, status), billingKw: b.kw };
    const why =
      b.by === "ratchet"
        ? `ratchet: ${charge.ratchet!.percent}% of the highest of the last ${Math.min(prev.length, charge.ratchet!.months)} billing demands = ${fmt(b.kw)} kW, above measured ${fmt(measured ?? 0)} kW`
        : b.by === "minimum"
          ? `minimum ${fmt(b.kw)} kW applies (measured ${fmt(measured ?? 0)} kW)`
          : `${source}`;
    const note = b.by === "measured" ? why : `${why}; ${source}`;
    return { line: line(charge, b.kw, "kW", charge.rate.flat, b.kw * charge.rate.flat, note, status), billingKw: b.kw };
  }

  // Demand inside periods: only windows wholly inside the period count.
  const rates = charge.rate.byPeriod;
  const names = version.periods.map((p) => p.name).filter((n) => n in rates);
  const parts: LinePart[] = [];
  let status: LineStatus = "exact";
  let note: string;
  if (iv && iv.kwh && iv.startMs.length > 0) {
    const byPeriod = st.windowDemandByPeriod(charge.windowMinutes);
    // Shape only: period peaks scaled so the highest of them matches the billed demand.
    let scale = 1;
    note = `highest ${windowText} average inside each period, from interval data`;
    const scaled = billedDemandScale(st);
    if (scaled !== null && scaled.scale !== 1) {
      scale = scaled.scale;
      status = "estimated";
      note = ctx.detail ? `estimated: each period's highest ${windowText} average from interval data × ${fmt(scale, 4)} (billed ${fmt(req.demandKw!)} kW against the meter's ${fmt(scaled.meterKw)} kW)` : "";
    }
    for (const name of names) {
      const p = version.periods.findIndex((x) => x.name === name);
      let kw = (byPeriod[p] ?? 0) * scale;
      if (charge.minimumKw !== null && kw < charge.minimumKw) kw = charge.minimumKw;
      parts.push({ label: name, quantity: kw, unit: "kW", rate: rates[name], amount: kw * rates[name] });
    }
  } else if (req.demandKw != null) {
    const shaped = st.hasShape();
    let overallMax = 0;
    const maxIn = new Array<number>(version.periods.length).fill(0);
    if (shaped) {
      const w = st.hourWeights();
      const idx = st.hourlyPeriods();
      for (let i = 0; i < w.length; i++) {
        if (w[i] > overallMax) overallMax = w[i];
        if (w[i] > maxIn[idx[i]]) maxIn[idx[i]] = w[i];
      }
    }
    for (const name of names) {
      const p = version.periods.findIndex((x) => x.name === name);
      let kw = shaped && overallMax > 0 ? (req.demandKw * maxIn[p]) / overallMax : req.demandKw;
      if (charge.minimumKw !== null && kw < charge.minimumKw) kw = charge.minimumKw;
      parts.push({ label: name, quantity: kw, unit: "kW", rate: rates[name], amount: kw * rates[name] });
    }
    status = shaped ? "estimated" : "needs-interval-data";
    note = shaped
      ? "estimated: billed maximum demand scaled by the load shape's highest hour in each period (no interval data)"
      : "needs interval data: billed maximum demand used for each period (an upper bound)";
  } else {
    for (const name of names) parts.push({ label: name, quantity: 0, unit: "kW", rate: rates[name], amount: 0 });
    status = "needs-interval-data";
    note = "needs interval data: no interval data and no billed demand";
  }
  const amount = sumAmounts(parts.map((p) => p.amount));
  const single = parts.length === 1;
  const text = ctx.detail ? `${parts.map((p) => `${p.label} ${fmt(p.quantity)} kW × ${fmt(p.rate, 6)}`).join(" + ")}; ${note}` : null;
  return {
    line: line(charge, single ? parts[0].quantity : null, "kW", single ? parts[0].rate : null, amount, text, status, parts),
    billingKw: null,
  };
}


/**
 * With interval data giving only the shape (`intervalsGive: "shape"`) and a billed demand: the
 * factor that takes the meter's demand to the billed one. The billed demand is read on the
 * window of the version's first demand charge (the window a bill prints); the factor is 1 when
 * the two agree within the rounding of a printed figure. Null when not in shape mode, without a
 * billed demand, or without a complete window in the data.
 */
function billedDemandScale(st: VersionState): { scale: number; meterKw: number; windowMinutes: number } | null {
  const { ctx, version } = st;
  const req = ctx.req;
  const iv = ctx.intervals;
  if (req.intervalsGive !== "shape" || req.demandKw == null || !iv || !iv.kwh || iv.startMs.length === 0) return null;
  const first = version.charges.find((c) => c.kind === "demand");
  const windowMinutes = first && first.kind === "demand" ? first.windowMinutes : 15;
  const meterKw = maxWindowDemandKw(iv.startMs, iv.kwh, iv.intervalMinutes, windowMinutes).kw;
  if (meterKw === null || meterKw <= 0) return null;
  return { scale: agreesWithinRounding(meterKw, req.demandKw) ? 1 : req.demandKw / meterKw, meterKw, windowMinutes };
}
