/**
 * Unit conversion factors, each exact from its definition and defined once.
 *
 * Sources: 1 Btu (International Table) = 1,055.05585262 J (NIST SP 811, appendix B.8);
 * 1 therm = 100,000 Btu (U.S. EIA); 1 kWh = 3.6 MJ; international foot = 0.3048 m exactly
 * (NIST SP 811); 1 U.S. gallon = 231 in³ exactly; natural gas heat content 1.037 therm per
 * ccf (U.S. EIA annual average, used only when a tariff states none).
 */

/** Joules in one Btu (International Table). */
const J_PER_BTU = 1055.05585262;
/** kWh in one therm: 100,000 Btu = 105.505585262 MJ, ÷ 3.6 MJ/kWh ≈ 29.3071. */
export const KWH_PER_THERM = (100_000 * J_PER_BTU) / 3_600_000;
/** kBtu in one kWh ≈ 3.412142. */
export const KBTU_PER_KWH = 3_600_000 / J_PER_BTU / 1000;
/** m² in one ft² = 0.3048² = 0.09290304 exactly. */
export const M2_PER_FT2 = 0.09290304;
/** ft² in one m² ≈ 10.7639. */
export const FT2_PER_M2 = 1 / M2_PER_FT2;
/** ft³ in one m³ ≈ 35.3147. */
export const FT3_PER_M3 = 1 / 0.3048 ** 3;
/** U.S. gallons in one ft³ = 1728 / 231 ≈ 7.48052. */
export const GAL_PER_FT3 = 12 ** 3 / 231;
/** U.S. gallons in one ccf (100 ft³) ≈ 748.052. */
export const GAL_PER_CCF = 100 * GAL_PER_FT3;
/** Therms in one ccf of natural gas when the tariff states no heat content (U.S. EIA average). */
export const DEFAULT_HEAT_CONTENT_THERM_PER_CCF = 1.037;

/** °F from °C. @example cToF(20) // 68 */
export function cToF(celsius: number): number {
  return celsius * 1.8 + 32;
}

/** °C from °F. @example fToC(68) // 20 */
export function fToC(fahrenheit: number): number {
  return ((fahrenheit - 32) * 5) / 9;
}
