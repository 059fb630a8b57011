/**
 * Code tables of the ESPI standard (NAESB REQ.21) that the import maps to ohmbook's input contract.
 *
 * Sources: ServiceKind, UnitSymbolKind (uom), UnitMultiplierKind (powerOfTenMultiplier),
 * QualityOfReading and the ISO 4217 numeric currency codes, as published with the ESPI schema
 * (espiDerived.xsd). uom 42 (m³), 72 (Wh) and 38 (W) are also listed in the TRuDI project's ESPI
 * notes; 72, 128 and 169 in the sample files' README; 119 (ft³) and the quality codes are written
 * from memory of the schema's enumerations.
 */
import type { Commodity } from "../../domain/types.ts";

/** UsagePoint ServiceCategory `kind` → commodity; other kinds (time, heat, refuse, …) have no meter kind in ohmbook. */
export const SERVICE_KIND: Readonly<Record<number, Commodity>> = { 0: "electricity", 1: "gas", 2: "water" };

/** Names of the ServiceKind codes ohmbook cannot import, for messages. */
export const SERVICE_KIND_NAMES: Readonly<Record<number, string>> = {
  3: "time", 4: "heat", 5: "refuse", 6: "sewerage", 7: "rates", 8: "tvLicence", 9: "internet",
};

/**
 * How a reading's unit becomes a meter unit of the input contract: the value × 10^powerOfTen
 * × 10^`shift` is in `unit`. `commodities` are those the unit may measure.
 */
export interface UomMapping {
  readonly symbol: string;
  readonly unit: string;
  readonly shift: number;
  readonly commodities: readonly Commodity[];
}

export const UOM: Readonly<Record<number, UomMapping>> = {
  72: { symbol: "Wh", unit: "kWh", shift: -3, commodities: ["electricity"] },
  169: { symbol: "therm", unit: "therm", shift: 0, commodities: ["gas"] },
  128: { symbol: "US gal", unit: "gal", shift: 0, commodities: ["water"] },
  42: { symbol: "m³", unit: "m3", shift: 0, commodities: ["gas", "water"] },
  119: { symbol: "ft³", unit: "ccf", shift: -2, commodities: ["gas", "water"] },
};

/** uom codes that are not energy or volume (power, current, voltage …), named for messages. */
export const UOM_NAMES: Readonly<Record<number, string>> = {
  0: "not applicable", 5: "A (current)", 29: "V (voltage)", 31: "J (joule)", 33: "Hz (frequency)", 38: "W (power)",
  61: "VA (apparent power)", 63: "VAr (reactive power)", 65: "cos φ (power factor)", 71: "VAh (apparent energy)",
  73: "VArh (reactive energy)", 106: "Ah (ampere-hours)",
};

/** UnitMultiplierKind: the powers of ten the schema allows. */
export const POWER_OF_TEN = new Set([-12, -9, -6, -3, -2, -1, 0, 1, 2, 3, 6, 9, 12]);

/** ISO 4217 numeric → alphabetic codes of the currencies Green Button producers use. */
export const CURRENCY: Readonly<Record<number, string>> = {
  840: "USD", 124: "CAD", 978: "EUR", 826: "GBP", 36: "AUD", 554: "NZD", 484: "MXN", 756: "CHF", 392: "JPY",
};

/** QualityOfReading codes (from memory of the schema) → meaning. */
export const QUALITY: Readonly<Record<number, string>> = {
  0: "valid", 7: "manually edited", 8: "estimated using reference day", 9: "estimated using linear interpolation",
  10: "questionable", 11: "derived", 12: "projected (forecast)", 13: "mixed", 14: "raw", 15: "normalized for weather",
  16: "other", 17: "validated", 18: "verified", 19: "revenue-quality",
};

/** Quality codes that mean an estimate: a bill with such a summary is `read_type: estimated`. */
export const ESTIMATED_QUALITY = new Set([8, 9]);

/** AccumulationKind 4 (deltaData): each reading is the use during its interval — the only kind ohmbook can take. */
export const ACCUMULATION_DELTA = 4;
/** FlowDirectionKind 1 (forward): energy delivered to the customer. */
export const FLOW_FORWARD = 1;

/** Interval lengths in seconds that the input contract accepts as interval data (5, 15, 30, 60 minutes). */
export const INTERVAL_SECONDS = new Set([300, 900, 1800, 3600]);
