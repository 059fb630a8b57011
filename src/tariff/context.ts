/**
 * Everything about one bill that does not depend on the tariff version: usage in the tariff's
 * unit, billing days, the bill's interval data cut to the service period with local times
 * computed once. Built by price.ts, read by price-version.ts.
 */
import type { PriceRequest } from "./types.ts";
import type { Tariff, TariffVersion } from "./model.ts";
import { assertZone, localMidnightMs } from "./calendar.ts";
import { localTimes, type LocalTimes } from "../core/time/index.ts";
import { PricingError } from "./errors.ts";
import { canonicalUnit, unitFactor } from "./units.ts";
import { lowerBound } from "../core/sorted.ts";
import { daysBetween, hoursOfWeek, isIsoDate } from "../core/time/index.ts";

export interface BillIntervals {
  startMs: Float64Array;
  /** Usage per interval in the tariff's unit. */
  usage: Float64Array;
  /** Energy per interval in kWh (electricity only; else null). */
  kwh: Float64Array | null;
  intervalMinutes: number;
  /** How many intervals a complete period would have. */
  expectedCount: number;
  local: LocalTimes;
}

export interface BillContext {
  tariff: Tariff;
  req: PriceRequest;
  days: number;
  startMs: number;
  endMs: number;
  /** Billed usage in the tariff's unit. */
  usage: number;
  /** Unit factor request unit -> tariff unit. */
  usageFactor: number;
  requestUnit: string;
  intervals: BillIntervals | null;
  /** Lazily built local times of each hour of the period, for estimates without intervals. */
  hourly(): { startMs: Float64Array; local: LocalTimes };
  /** The usage-independent work of the bill's period (shared by every price of a plan). */
  frame: BillFrame;
  /** False when only amounts are wanted (a forecast's scenarios): notes and part labels are left empty. */
  detail: boolean;
}

/** The parts of a request that a pricing plan fixes (everything but the quantities). */
export type FrameRequest = Pick<PriceRequest, "periodStart" | "periodEnd" | "timezone" | "usageUnit" | "powerFactor" | "loadShapeByHourOfWeek">;

/**
 * What does not depend on the bill's quantities: the period, its days and instants, the unit
 * factor, and (lazily) the hours with their local times and load-shape weights. Built once per
 * bill by `priceBill`, once per plan by `pricingPlan`.
 */
export interface BillFrame {
  days: number;
  startMs: number;
  endMs: number;
  usageFactor: number;
  requestUnit: string;
  hourly(): { startMs: Float64Array; local: LocalTimes };
  /** Weight of each hour of the period: the load shape when known, else 1 (split by hours). Not to be mutated. */
  hourWeights(): Float64Array;
  /** Whether the request's load shape has 168 values, some above 0 (checked once). */
  hasShape(): boolean;
  /** Usage-independent results cached per tariff version (version-state.ts). */
  byVersion: Map<TariffVersion, unknown>;
}

/**
 * Validates the usage-independent part of a request and prepares the frame.
 * @throws PricingError for impossible dates, an unknown zone, a unit that cannot be converted,
 *   a power factor outside (0, 1] or a malformed load shape.
 */
export function billFrame(tariff: Tariff, req: FrameRequest, usage?: number): BillFrame {
  if (!isIsoDate(req.periodStart) || !isIsoDate(req.periodEnd)) {
    throw new PricingError(`billing period ${req.periodStart} to ${req.periodEnd}: dates must be YYYY-MM-DD`);
  }
  const days = daysBetween(req.periodStart, req.periodEnd);
  if (days <= 0) throw new PricingError(`billing period ends (${req.periodEnd}) on or before it starts (${req.periodStart})`);
  assertZone(req.timezone);
  // (The usage check sits here for priceBill, so its errors keep their order.)
  if (usage !== undefined) checkUsage(usage);
  const requestUnit = canonicalUnit(tariff.commodity, req.usageUnit);
  const usageFactor = unitFactor(tariff.commodity, req.usageUnit, tariff.usageUnit, tariff.heatContentThermPerCcf);
  if (usageFactor === null || requestUnit === null) {
    throw new PricingError(
      `cannot convert ${req.usageUnit} to ${tariff.usageUnit} for a ${tariff.commodity} tariff ('${tariff.id}')`,
    );
  }
  if (req.powerFactor != null && !(req.powerFactor > 0 && req.powerFactor <= 1)) {
    throw new PricingError(`power factor ${req.powerFactor} is outside 0 < pf <= 1`);
  }
  return frameAfterChecks(req, days, requestUnit, usageFactor);
}

function checkUsage(usage: number): void {
  if (!Number.isFinite(usage)) throw new PricingError(`usage ${usage} is not a number`);
}

export function checkLoadShape(shape: readonly number[] | null | undefined): void {
  if (shape != null && (shape.length !== 168 || !shape.every((v) => Number.isFinite(v) && v >= 0))) {
    throw new PricingError(`the load shape must have 168 non-negative hour-of-week values (Monday 00:00 first); got ${shape.length}`);
  }
}

function frameAfterChecks(req: FrameRequest, days: number, requestUnit: string, usageFactor: number): BillFrame {
  const startMs = localMidnightMs(req.periodStart, req.timezone);
  const endMs = localMidnightMs(req.periodEnd, req.timezone);
  let hourlyCache: { startMs: Float64Array; local: LocalTimes } | null = null;
  let weights: Float64Array | null = null;
  let shaped: boolean | null = null;
  const hourly = () => (hourlyCache ??= hourlyGrid(startMs, endMs, req.timezone));
  return {
    days,
    startMs,
    endMs,
    usageFactor,
    requestUnit,
    hourly,
    hourWeights() {
      if (weights) return weights;
      const h = hourly();
      const shape = req.loadShapeByHourOfWeek;
      const w = new Float64Array(h.startMs.length);
      if (shape && shape.length === 168) {
        const how = hoursOfWeek(h.local);
        for (let i = 0; i < w.length; i++) w[i] = Math.max(0, shape[how[i]] ?? 0);
      } else {
        w.fill(1);
      }
      return (weights = w);
    },
    hasShape() {
      const s = req.loadShapeByHourOfWeek;
      return (shaped ??= !!s && s.length === 168 && s.some((v) => v > 0));
    },
    byVersion: new Map(),
  };
}

/**
 * Validates a request against a tariff and prepares the bill context.
 *
 * @param frame the request's frame when already built (a pricing plan); its checks are not repeated
 * @throws PricingError for impossible dates, an unknown zone, a unit that cannot be converted,
 *   a non-finite usage or a power factor outside (0, 1].
 */
export function billContext(tariff: Tariff, req: PriceRequest, frame?: BillFrame, detail = true): BillContext {
  const own = frame === undefined;
  if (frame === undefined) {
    frame = billFrame(tariff, req, req.usage);
  } else {
    checkUsage(req.usage);
  }
  if (req.demandKw != null && !(Number.isFinite(req.demandKw) && req.demandKw >= 0)) {
    throw new PricingError(`demand ${req.demandKw} kW is not a non-negative number`);
  }
  // A plan's frame checked its load shape once (pricingPlan); the request carries the same one.
  if (own) checkLoadShape(req.loadShapeByHourOfWeek);
  const prev = req.previousBillingDemandsKw ?? [];
  for (let i = 0; i < prev.length; i++) {
    const v = prev[i];
    if (!(Number.isFinite(v) && v >= 0)) throw new PricingError("previous billing demands must be non-negative numbers (kW)");
  }
  const { startMs, endMs, usageFactor } = frame;

  let intervals: BillIntervals | null = null;
  const iv = req.intervals;
  if (iv && iv.startMs.length > 0) {
    if (!(iv.intervalMinutes > 0) || iv.startMs.length !== iv.values.length) {
      throw new PricingError("interval data is malformed (length mismatch or interval length not positive)");
    }
    const a = lowerBound(iv.startMs, startMs);
    const b = lowerBound(iv.startMs, endMs);
    const start = iv.startMs.subarray(a, b);
    const raw = iv.values.subarray(a, b);
    const usage = usageFactor === 1 ? raw : raw.map((v) => v * usageFactor);
    let kwh: Float64Array | null = null;
    if (tariff.commodity === "electricity") {
      const f = unitFactor("electricity", req.usageUnit, "kWh") as number;
      kwh = f === 1 ? raw : raw.map((v) => v * f);
    }
    intervals = {
      startMs: start,
      usage,
      kwh,
      intervalMinutes: iv.intervalMinutes,
      expectedCount: Math.round((endMs - startMs) / (iv.intervalMinutes * 60_000)),
      local: sharedLocalTimes(start, req.timezone),
    };
  }

  return {
    tariff,
    req,
    days: frame.days,
    startMs,
    endMs,
    usage: req.usage * usageFactor,
    usageFactor,
    requestUnit: frame.requestUnit,
    intervals,
    hourly: frame.hourly,
    frame,
    detail,
  };
}

/*
 * A forecast prices the same month hundreds of times (one call per weather scenario) with the same
 * instants, only the usage differs; local times depend only on the instants and the zone, so they
 * are computed once. Keyed by the instants' buffer (a subarray of one shape shares it) and never
 * mutated by callers.
 */
const localTimesByBuffer = new WeakMap<ArrayBufferLike, Map<string, LocalTimes>>();

function sharedLocalTimes(startMs: Float64Array, zone: string): LocalTimes {
  let byView = localTimesByBuffer.get(startMs.buffer);
  if (byView === undefined) localTimesByBuffer.set(startMs.buffer, (byView = new Map()));
  const key = `${startMs.byteOffset}|${startMs.length}|${zone}`;
  let lt = byView.get(key);
  if (lt === undefined) byView.set(key, (lt = localTimes(startMs, zone)));
  return lt;
}

const hourlyGrids = new Map<string, { startMs: Float64Array; local: LocalTimes }>();

/** The hours of a billing period with their local times, shared by every bill over the same period. */
function hourlyGrid(startMs: number, endMs: number, zone: string): { startMs: Float64Array; local: LocalTimes } {
  const key = `${zone}|${startMs}|${endMs}`;
  let grid = hourlyGrids.get(key);
  if (grid === undefined) {
    const n = Math.round((endMs - startMs) / 3_600_000);
    const s = new Float64Array(n);
    for (let i = 0; i < n; i++) s[i] = startMs + i * 3_600_000;
    if (hourlyGrids.size >= 512) hourlyGrids.clear(); // a bound, not an eviction policy: periods repeat in runs
    hourlyGrids.set(key, (grid = { startMs: s, local: localTimes(s, zone) }));
  }
  return grid;
}
