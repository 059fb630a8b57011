/**
 * The loaded, validated form of a tariff file. Every version is self-contained: `inherit`
 * and `charges_override` were resolved by the loader, period names were checked, blocks are
 * in order. Pricing (price.ts) trusts these invariants and never re-validates.
 */
import type { Commodity } from "../domain/types.ts";

/** Label of the line the minimum bill adds; percent lines may name it in `of`. */
export const MINIMUM_BILL_LABEL = "Minimum bill adjustment";

/** Which days a time-of-use period covers. Observed holidays count as weekends. */
export type DayKind = "weekdays" | "weekends" | "all";

/** A clock range in minutes after local midnight; `endMin` is exclusive and may be 1440. Wraps midnight when end <= start. */
export interface HourRange {
  startMin: number;
  endMin: number;
}

export interface Season {
  name: string;
  /** Calendar months (1 = January) in the season. */
  months: number[];
}

export interface Period {
  name: string;
  /** Season name, or null for every month. */
  season: string | null;
  days: DayKind;
  /** null = all day. */
  hours: HourRange[] | null;
  /** True for the `{}` catch-all. */
  catchAll: boolean;
}

/** `us-federal` = observed holidays of 5 U.S.C. 6103; a list = those local dates. */
export type HolidayRule = { kind: "us-federal" } | { kind: "dates"; dates: string[] } | null;

export interface Block {
  /** Upper bound of the block in the tariff's usage unit; null for the last block. */
  upTo: number | null;
  rate: number;
}

/** A flat rate, or one rate per period name. */
export type RateSpec = { flat: number } | { byPeriod: Record<string, number> };

export interface Ratchet {
  /** Share of the highest previous billing demand, percent (0, 100]. */
  percent: number;
  /** How many previous bills to look back over. */
  months: number;
}

export type Charge =
  | { kind: "fixed"; label: string; amount: number }
  | { kind: "blocks"; label: string; blocks: Block[]; scaleByDays: boolean }
  | { kind: "energy"; label: string; rate: RateSpec }
  | {
      kind: "demand";
      label: string;
      rate: RateSpec;
      windowMinutes: number;
      ratchet: Ratchet | null;
      minimumKw: number | null;
    }
  | { kind: "power-factor"; label: string; targetPf: number }
  | { kind: "percent"; label: string; percent: number; of: "all" | string[] };

export interface TariffVersion {
  /** First day the version is in force, `YYYY-MM-DD`. */
  from: string;
  /** First day it no longer is (the next version's `from`), or null. */
  until: string | null;
  seasons: Season[];
  holidays: HolidayRule;
  /** In matching order; when non-empty the last one is the catch-all. */
  periods: Period[];
  charges: Charge[];
  minimumBill: number | null;
  /** 1-based line of the version in the file, for messages. */
  line: number;
}

export interface Tariff {
  id: string;
  name: string;
  commodity: Commodity;
  /** Canonical spelling, e.g. kWh, therm, gal. */
  usageUnit: string;
  currency: string;
  /** therm per ccf (gas); 1.037 when the file does not say. */
  heatContentThermPerCcf: number;
  /** Whether `heat_content` was written in the file (pages state the default otherwise). */
  heatContentStated: boolean;
  versions: TariffVersion[];
  file: string;
}
