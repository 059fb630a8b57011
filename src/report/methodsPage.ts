/** View model of the methods page. The prose lives in the template; numbers and sources here. */
import type { MethodsPage, UnitFactorRow } from "./siteModel.ts";
import { navFor } from "./nav.ts";

/** Unit factors the pipeline uses, with where each comes from. */
export const UNIT_FACTORS: readonly UnitFactorRow[] = [
  { from: "1 MWh", to: "kWh", factor: "1,000", source: "SI prefix (exact)" },
  { from: "1 kWh", to: "MJ", factor: "3.6", source: "SI definition of the watt-hour (exact)" },
  { from: "1 kWh", to: "Btu", factor: "3,412.14", source: "Btu (International Table) = 1,055.05585262 J, NIST SP 811" },
  { from: "1 therm", to: "kWh", factor: "29.3071", source: "1 therm = 100,000 Btu (U.S. EIA), converted with NIST SP 811" },
  { from: "1 ccf of gas", to: "therm", factor: "1.037 unless the tariff states its own heat content", source: "U.S. EIA average heat content of natural gas, about 1,037 Btu per cubic foot" },
  { from: "1 ccf of water", to: "US gallons", factor: "748.052", source: "1 US gallon = 231 cubic inches (exact), 100 ft³ = 172,800 in³" },
  { from: "1 m³", to: "US gallons", factor: "264.172", source: "1 US gallon = 3.785411784 L (exact), NIST SP 811" },
  { from: "1 ft²", to: "m²", factor: "0.09290304", source: "international foot = 0.3048 m (exact)" },
];

/**
 * Builds the methods page model.
 * @example buildMethodsPage("USD", "Jan 1, 2025 – Dec 31, 2025").unitFactors.length // 8
 */
export function buildMethodsPage(currency: string, windowText: string): Omit<MethodsPage, "canonical"> {
  return {
    title: "Methods",
    root: "",
    path: "methods.html",
    nav: navFor("methods", ""),
    currency,
    unitFactors: [...UNIT_FACTORS],
    windowText,
  };
}
