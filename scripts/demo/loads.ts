/**
 * Simulated consumption: electricity per 15-minute interval, gas and water per local day.
 * Each is base load + occupancy + a change-point response to outdoor temperature + noise,
 * the shape practitioners fit with 3P/4P change-point models.
 */
import type { ZoneCalendar } from "./calendar.ts";
import type { BuildingDef, ElectricLoad, GasLoad, WaterLoad } from "./definition.ts";
import { dailyOccupancy, occupancyFraction } from "./occupancy.ts";
import { Rng } from "./prng.ts";

/**
 * Energy per 15-minute interval, kWh, for one electric meter over the whole calendar.
 * kW = base·(1+slow) + occupied·occ + cool·(T − Tc)⁺·(0.35 + 0.65·occ) + heat·(Th − T)⁺·(0.6 + 0.4·occ) + fast
 */
export function simulateElectricKwh(
  meterId: string,
  building: BuildingDef,
  load: ElectricLoad,
  cal: ZoneCalendar,
  tempC: Float64Array,
): Float64Array {
  const rng = Rng.forKey(`electric:${meterId}`);
  const n = cal.startMs.length;
  const kwh = new Float64Array(n);
  const fastSd = 0.018 * (load.baseKw + load.occupiedKw);
  let fast = 0;
  let slow = 0;
  let lastDay = -1;
  for (let i = 0; i < n; i++) {
    const di = cal.intervalDay[i];
    if (di !== lastDay) {
      slow = 0.6 * slow + 0.02 * rng.normal();
      lastDay = di;
    }
    fast = 0.8 * fast + fastSd * 0.6 * rng.normal();
    const occ = occupancyFraction(building.useType, cal.days[di], cal.clockMinute[i]);
    const t = tempC[i];
    const kw =
      load.baseKw * (1 + slow) +
      load.occupiedKw * occ +
      load.coolKwPerC * Math.max(0, t - load.coolBalanceC) * (0.35 + 0.65 * occ) +
      load.heatKwPerC * Math.max(0, load.heatBalanceC - t) * (0.6 + 0.4 * occ) +
      fast;
    kwh[i] = Math.max(0.2 * load.baseKw, kw) / 4;
  }
  return kwh;
}

/**
 * Gas use per local day, therms: base (hot water, kitchens) + heating slope × (balance − daily mean T)⁺,
 * with the heating set back on unoccupied days and ±3 % daily noise.
 */
export function simulateGasThermsPerDay(
  meterId: string,
  building: BuildingDef,
  load: GasLoad,
  cal: ZoneCalendar,
  dailyMeanC: Float64Array,
): Float64Array {
  const rng = Rng.forKey(`gas:${meterId}`);
  const out = new Float64Array(cal.days.length);
  const residential = building.useType === "multifamily";
  cal.days.forEach((day, di) => {
    const occ = dailyOccupancy(building.useType, day);
    const busy = residential ? 1 : Math.min(1, 0.55 + 1.2 * occ);
    const heat = load.heatThermsPerDegC * Math.max(0, load.heatBalanceC - dailyMeanC[di]) * (residential ? 1 : 0.8 + 0.2 * busy);
    out[di] = Math.max(0, (load.baseThermsPerDay * busy + heat) * (1 + 0.03 * rng.normal()));
  });
  return out;
}

/** Water use per local day, gallons: base + occupied use, a summer uplift and ±5 % noise. */
export function simulateWaterGalPerDay(
  meterId: string,
  building: BuildingDef,
  load: WaterLoad,
  cal: ZoneCalendar,
): Float64Array {
  const rng = Rng.forKey(`water:${meterId}`);
  const out = new Float64Array(cal.days.length);
  cal.days.forEach((day, di) => {
    const occ = dailyOccupancy(building.useType, day);
    const summer = Math.max(0, -Math.cos((2 * Math.PI * (day.dayOfYear - 20)) / 365.25));
    const gal = (load.baseGalPerDay + load.occupiedGalPerDay * occ * 2.2) * (1 + load.summerUplift * summer);
    out[di] = Math.max(0, gal * (1 + 0.05 * rng.normal()));
  });
  return out;
}
