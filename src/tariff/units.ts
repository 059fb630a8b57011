/**
 * Usage-unit conversion between what a bill is measured in and what a tariff is quoted in.
 *
 * The factors and their sources are src/core/units.ts; ccf → therm uses the tariff's heat
 * content (therm per ccf, default DEFAULT_HEAT_CONTENT_THERM_PER_CCF).
 */
import type { Commodity } from "../domain/types.ts";

import { DEFAULT_HEAT_CONTENT_THERM_PER_CCF, FT3_PER_M3, GAL_PER_CCF, GAL_PER_FT3, KWH_PER_THERM } from "../core/units.ts";

/** Canonical unit names accepted per commodity (matching is case-insensitive). */
export const UNITS_BY_COMMODITY: Record<Commodity, readonly string[]> = {
  electricity: ["kWh", "MWh"],
  gas: ["therm", "ccf", "m3", "kWh"],
  water: ["gal", "kgal", "ccf", "m3"],
};

/** Returns the canonical spelling of `unit` for the commodity, or null when it is not one of its units. */
export function canonicalUnit(commodity: Commodity, unit: string): string | null {
  const u = unit.trim().toLowerCase();
  const alias = u === "therms" ? "therm" : u === "m³" ? "m3" : u === "gallons" || u === "gallon" ? "gal" : u;
  return UNITS_BY_COMMODITY[commodity].find((c) => c.toLowerCase() === alias) ?? null;
}

/** Size of one `unit` in the commodity's base unit (electricity kWh, gas therm, water gal). */
function baseFactor(commodity: Commodity, unit: string, heatContentThermPerCcf: number): number {
  switch (commodity) {
    case "electricity":
      return unit === "MWh" ? 1000 : 1;
    case "gas":
      if (unit === "therm") return 1;
      if (unit === "ccf") return heatContentThermPerCcf;
      if (unit === "m3") return (FT3_PER_M3 / 100) * heatContentThermPerCcf;
      return 1 / KWH_PER_THERM; // kWh
    case "water":
      if (unit === "gal") return 1;
      if (unit === "kgal") return 1000;
      if (unit === "ccf") return GAL_PER_CCF;
      return FT3_PER_M3 * GAL_PER_FT3; // m3
  }
}

/**
 * Factor f such that `quantity in fromUnit × f = quantity in toUnit`, or null when either unit
 * does not belong to the commodity.
 *
 * @example unitFactor("gas", "ccf", "therm", 1.037) // 1.037
 * @example unitFactor("water", "ccf", "gal", 1.037) // 748.0519…
 */
export function unitFactor(
  commodity: Commodity,
  fromUnit: string,
  toUnit: string,
  heatContentThermPerCcf = DEFAULT_HEAT_CONTENT_THERM_PER_CCF,
): number | null {
  const from = canonicalUnit(commodity, fromUnit);
  const to = canonicalUnit(commodity, toUnit);
  if (from === null || to === null) return null;
  if (from === to) return 1;
  return baseFactor(commodity, from, heatContentThermPerCcf) / baseFactor(commodity, to, heatContentThermPerCcf);
}
