/**
 * Portfolio-pooled hourly model for meters with too little history of their own: one
 * gradient-boosted tree model fitted across the short meter and similar meters, with each
 * meter's energy divided by its own scale (so buildings of different size share one shape)
 * and the building's index as a tree feature (so buildings may still differ in shape).
 *
 * Scales are means over the short meter's own time window, so that a short winter history
 * is compared with the pool members' same winter weeks, not with their annual means.
 */
import { ModelInputError } from "../errors.ts";
import { gbdtSpec } from "./gbdtHourly.ts";
import type { GbdtHourlyOptions } from "./gbdtHourly.ts";
import type { FittedHourlyModel, HourlyFrame, HourlyModelSpec } from "./types.ts";

/** Another meter offered to the pool: its own hourly table (built with the same feature options). */
export interface PoolMember {
  meterId: string;
  frame: HourlyFrame;
}

export interface PooledModel extends FittedHourlyModel {
  readonly kind: "pooled-gbdt";
  /** Meter ids in building-index order (index 0 = the meter being modelled). */
  meterIds: string[];
  /** Scale (mean kWh per hour over the target's window, or overall when too thin) per meter. */
  scalesKwh: number[];
  /** Rows contributed per meter. */
  rowsByMeter: number[];
}

/** A member's scale falls back to its overall mean when it has fewer rows than this in the window. */
const MIN_ROWS_IN_WINDOW = 168;

function meanOf(a: ArrayLike<number>, from = 0, to = a.length): number {
  let s = 0;
  for (let i = from; i < to; i++) s += a[i]!;
  return s / (to - from);
}

/**
 * Pooled model spec for the meter `meterId`. When fitted on (part of) that meter's table,
 * members contribute only hours up to the last training hour, so cross-validation never sees
 * other meters' future either.
 * @throws ModelInputError (at fit) when a scale is not positive or no member has usable rows.
 * @example pooledGbdtSpec("M7", [{ meterId: "M1", frame: f1 }]).fit(shortFrame).predict(shortFrame)
 */
export function pooledGbdtSpec(meterId: string, members: readonly PoolMember[], options: GbdtHourlyOptions = {}): HourlyModelSpec {
  return {
    kind: "pooled-gbdt",
    fit(train: HourlyFrame): PooledModel {
      if (train.kwh.length === 0) throw new ModelInputError(`meter ${meterId}: no hours to pool`);
      const t0 = train.hourStartMs[0]!;
      const t1 = train.hourStartMs[train.hourStartMs.length - 1]!;
      const parts: { id: string; frame: HourlyFrame; end: number; scale: number }[] = [];
      const ownScale = meanOf(train.kwh);
      if (!(ownScale > 0)) throw new ModelInputError(`meter ${meterId}: mean hourly use is ${ownScale}; pooling needs a positive scale`);
      parts.push({ id: meterId, frame: train, end: train.kwh.length, scale: ownScale });
      for (const m of members) {
        if (m.meterId === meterId) continue;
        const hs = m.frame.hourStartMs;
        let end = 0;
        while (end < hs.length && hs[end]! <= t1) end++;
        if (end === 0) continue;
        let a = 0;
        while (a < end && hs[a]! < t0) a++;
        const scale = end - a >= MIN_ROWS_IN_WINDOW ? meanOf(m.frame.kwh, a, end) : meanOf(m.frame.kwh, 0, end);
        if (!(scale > 0)) continue;
        parts.push({ id: m.meterId, frame: m.frame, end, scale });
      }
      if (parts.length < 2) throw new ModelInputError(`meter ${meterId}: no pool member has usable hours before ${new Date(t1).toISOString()}`);
      const stacked = stackFrames(parts);
      const inner = gbdtSpec(options).fit(stacked);
      const ownIndex = 0;
      return {
        kind: "pooled-gbdt",
        parameterCount: inner.parameterCount,
        meterIds: parts.map((p) => p.id),
        scalesKwh: parts.map((p) => p.scale),
        rowsByMeter: parts.map((p) => p.end),
        predict(f) {
          const withIndex = { ...f, buildingIndex: new Uint16Array(f.tempC.length).fill(ownIndex) };
          return inner.predict(withIndex).map((v) => v * ownScale);
        },
      };
    },
  };
}

/** Stack the meters' rows, interleaved by time so the early-stopping block is the latest hours of every meter, targets divided by each meter's scale. */
function stackFrames(parts: { frame: HourlyFrame; end: number; scale: number }[]): HourlyFrame {
  const order: [number, number][] = [];
  parts.forEach((p, b) => {
    for (let i = 0; i < p.end; i++) order.push([b, i]);
  });
  order.sort((x, y) => parts[x[0]]!.frame.hourStartMs[x[1]]! - parts[y[0]]!.frame.hourStartMs[y[1]]! || x[0] - y[0]);
  const n = order.length;
  const out: HourlyFrame = {
    hourStartMs: new Float64Array(n),
    hourOfWeek: new Uint8Array(n),
    holiday: new Uint8Array(n),
    dayOfYear: new Uint16Array(n),
    month: new Uint8Array(n),
    tempC: new Float64Array(n),
    tempSmoothC: new Float64Array(n),
    tempSlopeCPerHour: new Float64Array(n),
    tempLagC: new Float64Array(n),
    tempRollingMeanC: new Float64Array(n),
    buildingIndex: new Uint16Array(n),
    kwh: new Float64Array(n),
    accounting: parts[0]!.frame.accounting,
  };
  order.forEach(([b, i], r) => {
    const f = parts[b]!.frame;
    out.hourStartMs[r] = f.hourStartMs[i]!;
    out.hourOfWeek[r] = f.hourOfWeek[i]!;
    out.holiday[r] = f.holiday[i]!;
    out.dayOfYear[r] = f.dayOfYear[i]!;
    out.month[r] = f.month[i]!;
    out.tempC[r] = f.tempC[i]!;
    out.tempSmoothC[r] = f.tempSmoothC[i]!;
    out.tempSlopeCPerHour[r] = f.tempSlopeCPerHour[i]!;
    out.tempLagC[r] = f.tempLagC[i]!;
    out.tempRollingMeanC[r] = f.tempRollingMeanC[i]!;
    out.buildingIndex![r] = b;
    out.kwh[r] = f.kwh[i]! / parts[b]!.scale;
  });
  return out;
}
