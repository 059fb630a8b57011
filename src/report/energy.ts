/**
 * Energy units for intensity figures: site energy in kWh from billed use, energy use intensity
 * (EUI) per floor area, and the kWh/m² → kBtu/ft² conversion. Pure.
 */
import { DEFAULT_HEAT_CONTENT_THERM_PER_CCF, FT2_PER_M2, KBTU_PER_KWH, KWH_PER_THERM } from "../core/units.ts";

/**
 * Site energy in kWh of a billed quantity, or null when the commodity/unit is not energy we
 * convert (water; gas in m³, whose heat content varies).
 * @example siteKwh("gas", "therm", 10) // 293.071
 */
export function siteKwh(commodity: string, unit: string, quantity: number): number | null {
  const u = unit.toLowerCase();
  if (commodity === "electricity") {
    if (u === "kwh") return quantity;
    if (u === "mwh") return quantity * 1000;
    return null;
  }
  if (commodity === "gas") {
    if (u === "therm" || u === "therms") return quantity * KWH_PER_THERM;
    if (u === "ccf") return quantity * DEFAULT_HEAT_CONTENT_THERM_PER_CCF * KWH_PER_THERM;
    if (u === "kwh") return quantity;
    return null;
  }
  return null;
}

/**
 * kWh/m² expressed as kBtu/ft²: × 3.412142 kBtu/kWh ÷ 10.7639 ft²/m².
 * @example kwhPerM2ToKbtuPerFt2(100) // ≈ 31.70
 */
export function kwhPerM2ToKbtuPerFt2(kwhPerM2: number): number {
  return (kwhPerM2 * KBTU_PER_KWH) / FT2_PER_M2;
}

/**
 * Energy use intensity in kWh/m²; null when the area is not positive.
 * @example euiKwhPerM2(250_000, 1000) // 250
 */
export function euiKwhPerM2(siteEnergyKwh: number, floorAreaM2: number): number | null {
  if (!(floorAreaM2 > 0) || !Number.isFinite(siteEnergyKwh)) return null;
  return siteEnergyKwh / floorAreaM2;
}
