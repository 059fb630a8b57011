/**
 * The invented portfolio: company, regions, weather stations, buildings and meters, with the
 * load parameters each simulated meter uses. Every name here is fictional.
 */
import type { Commodity } from "../../src/domain/types.ts";

export const COMPANY_NAME = "Quillmere Property Trust";
export const AS_OF = "2025-12-31";
/** First local day simulated (the first bills start in December 2022). */
export const SIM_START = "2022-12-01";
/** First local day NOT simulated. */
export const SIM_END = "2026-01-01";
/** TOU version of the large-service tariff and the first day interval data must cover. */
export const INTERVAL_ERA_START = "2024-10-01";

export interface StationDef {
  stationId: string;
  zone: string;
  /** Header unit written in the weather file. */
  fileUnit: "C" | "F";
  annualMeanC: number;
  /** Half the difference between the warmest and the coldest month. */
  seasonalAmplitudeC: number;
  /** Half the typical day–night swing. */
  diurnalAmplitudeC: number;
  /** Day-to-day weather anomaly spread (stationary standard deviation, °C). */
  synopticSdC: number;
  /** Gaps removed from the written file: local date, first local hour, hours. */
  gaps: { date: string; hour: number; hours: number }[];
  /** Whether a typical-year file is written under weather/normals/. */
  normals: boolean;
}

export const STATIONS: StationDef[] = [
  {
    stationId: "WX-HARROW",
    zone: "America/New_York",
    fileUnit: "F",
    annualMeanC: 12.8,
    seasonalAmplitudeC: 12.6,
    diurnalAmplitudeC: 4.2,
    synopticSdC: 3.0,
    gaps: [
      { date: "2023-03-14", hour: 9, hours: 2 },
      { date: "2023-08-02", hour: 16, hours: 1 },
      { date: "2024-01-21", hour: 3, hours: 4 },
      { date: "2024-07-09", hour: 11, hours: 9 },
      { date: "2025-05-17", hour: 22, hours: 3 },
    ],
    normals: false,
  },
  {
    stationId: "WX-PRAIRIE",
    zone: "America/Chicago",
    fileUnit: "C",
    annualMeanC: 10.4,
    seasonalAmplitudeC: 14.4,
    diurnalAmplitudeC: 5.1,
    synopticSdC: 3.6,
    gaps: [
      { date: "2023-06-05", hour: 13, hours: 3 },
      { date: "2024-02-11", hour: 0, hours: 2 },
      { date: "2024-12-19", hour: 6, hours: 8 },
      { date: "2025-09-03", hour: 20, hours: 1 },
    ],
    normals: true,
  },
];

export type UseType =
  | "office"
  | "school"
  | "retail"
  | "multifamily"
  | "warehouse"
  | "clinic"
  | "library"
  | "lab";

export interface BuildingDef {
  buildingId: string;
  name: string;
  floorArea: number;
  areaUnit: "ft2" | "m2";
  stationId: string;
  useType: UseType;
  tenantPage: boolean;
}

export const BUILDINGS: BuildingDef[] = [
  { buildingId: "ashelm", name: 'Ash & Elm "Commons" <North>', floorArea: 182000, areaUnit: "ft2", stationId: "WX-HARROW", useType: "multifamily", tenantPage: true },
  { buildingId: "quill-tower", name: "Quillmere Tower", floorArea: 238500, areaUnit: "ft2", stationId: "WX-HARROW", useType: "office", tenantPage: false },
  { buildingId: "northgate-lab", name: "Northgate Research Laboratory", floorArea: 6150, areaUnit: "m2", stationId: "WX-HARROW", useType: "lab", tenantPage: false },
  { buildingId: "birchfield-school", name: "Birchfield Academy", floorArea: 86400, areaUnit: "ft2", stationId: "WX-HARROW", useType: "school", tenantPage: false },
  { buildingId: "millbrook-market", name: "Millbrook Market Hall", floorArea: 41800, areaUnit: "ft2", stationId: "WX-PRAIRIE", useType: "retail", tenantPage: false },
  { buildingId: "cedar-flats", name: "Cedar Flats Distribution Centre", floorArea: 12400, areaUnit: "m2", stationId: "WX-PRAIRIE", useType: "warehouse", tenantPage: false },
  { buildingId: "willow-clinic", name: "Willow Bend Family Clinic", floorArea: 17600, areaUnit: "ft2", stationId: "WX-PRAIRIE", useType: "clinic", tenantPage: true },
  { buildingId: "fenwick-library", name: "Fenwick Library & Community Centre", floorArea: 23900, areaUnit: "ft2", stationId: "WX-PRAIRIE", useType: "library", tenantPage: false },
];

/** Electric load shape of one meter, kW. */
export interface ElectricLoad {
  baseKw: number;
  /** Added at full occupancy. */
  occupiedKw: number;
  /** Cooling kW per °C above `coolBalanceC`. */
  coolKwPerC: number;
  coolBalanceC: number;
  /** Electric heating kW per °C below `heatBalanceC` (0 for gas-heated buildings). */
  heatKwPerC: number;
  heatBalanceC: number;
}

/** Gas use per day, in therms. */
export interface GasLoad {
  baseThermsPerDay: number;
  heatThermsPerDegC: number;
  heatBalanceC: number;
}

/** Water use per day, in gallons. */
export interface WaterLoad {
  baseGalPerDay: number;
  occupiedGalPerDay: number;
  /** Fractional summer uplift (irrigation, cooling towers). */
  summerUplift: number;
}

export interface MeterDef {
  meterId: string;
  buildingId: string;
  commodity: Commodity;
  unit: string;
  tariffId: string;
  multiplier: number;
  account: string;
  electric?: ElectricLoad;
  gas?: GasLoad;
  water?: WaterLoad;
  /** Interval data written for this meter. */
  interval?: {
    /** Decimals of the values in the file. */
    decimals: number;
    /** How the file(s) are written. */
    layout: "offset" | "offset-split-by-year" | "local-no-offset";
  };
  /** Bills print the power factor. */
  printsPowerFactor?: boolean;
  /** Bills print the measured demand. */
  printsDemand?: boolean;
  /** bill_lines.csv carries this meter's printed lines. */
  printsLines?: boolean;
}

export const METERS: MeterDef[] = [
  // Ash & Elm: master-metered apartments.
  { meterId: "ASH-E", buildingId: "ashelm", commodity: "electricity", unit: "kWh", tariffId: "harrow-sc", multiplier: 1, account: "HV-4410-2291",
    electric: { baseKw: 118, occupiedKw: 95, coolKwPerC: 16, coolBalanceC: 19, heatKwPerC: 0, heatBalanceC: 0 } },
  { meterId: "ASH-G", buildingId: "ashelm", commodity: "gas", unit: "ccf", tariffId: "harrow-gas", multiplier: 1, account: "HV-4410-2292",
    gas: { baseThermsPerDay: 62, heatThermsPerDegC: 21, heatBalanceC: 16.5 }, printsLines: true },
  { meterId: "ASH-W", buildingId: "ashelm", commodity: "water", unit: "ccf", tariffId: "harrow-water", multiplier: 1, account: "HWB-118-0457",
    water: { baseGalPerDay: 9800, occupiedGalPerDay: 0, summerUplift: 0.08 } },
  // Quillmere Tower: large office on the time-of-use service, CT-metered (multiplier 40).
  { meterId: "TWR-E", buildingId: "quill-tower", commodity: "electricity", unit: "kWh", tariffId: "harrow-gs-tou", multiplier: 40, account: "HV-7702-0018",
    electric: { baseKw: 265, occupiedKw: 410, coolKwPerC: 38, coolBalanceC: 14, heatKwPerC: 0, heatBalanceC: 0 },
    interval: { decimals: 3, layout: "offset" }, printsPowerFactor: true, printsDemand: true, printsLines: true },
  { meterId: "TWR-G", buildingId: "quill-tower", commodity: "gas", unit: "therm", tariffId: "harrow-gas", multiplier: 1, account: "HV-7702-0019",
    gas: { baseThermsPerDay: 24, heatThermsPerDegC: 27, heatBalanceC: 14.5 } },
  { meterId: "TWR-W", buildingId: "quill-tower", commodity: "water", unit: "ccf", tariffId: "harrow-water", multiplier: 1, account: "HWB-220-1187",
    water: { baseGalPerDay: 1400, occupiedGalPerDay: 5200, summerUplift: 0.35 } },
  // Northgate lab: high base load around the clock.
  { meterId: "LAB-E", buildingId: "northgate-lab", commodity: "electricity", unit: "kWh", tariffId: "harrow-gs-tou", multiplier: 1, account: "HV-7702-0544",
    electric: { baseKw: 330, occupiedKw: 140, coolKwPerC: 21, coolBalanceC: 13, heatKwPerC: 0, heatBalanceC: 0 },
    interval: { decimals: 2, layout: "offset-split-by-year" }, printsPowerFactor: true, printsDemand: true },
  { meterId: "LAB-G", buildingId: "northgate-lab", commodity: "gas", unit: "therm", tariffId: "harrow-gas", multiplier: 1, account: "HV-7702-0545",
    gas: { baseThermsPerDay: 55, heatThermsPerDegC: 14, heatBalanceC: 15.5 } },
  { meterId: "LAB-W", buildingId: "northgate-lab", commodity: "water", unit: "ccf", tariffId: "harrow-water", multiplier: 1, account: "HWB-220-3310",
    water: { baseGalPerDay: 2600, occupiedGalPerDay: 1800, summerUplift: 0.3 } },
  // Birchfield Academy: school calendar, small-commercial service.
  { meterId: "SCH-E", buildingId: "birchfield-school", commodity: "electricity", unit: "kWh", tariffId: "harrow-sc", multiplier: 1, account: "HV-5120-7781",
    electric: { baseKw: 34, occupiedKw: 120, coolKwPerC: 7.5, coolBalanceC: 17, heatKwPerC: 0, heatBalanceC: 0 } },
  { meterId: "SCH-G", buildingId: "birchfield-school", commodity: "gas", unit: "ccf", tariffId: "harrow-gas", multiplier: 1, account: "HV-5120-7782",
    gas: { baseThermsPerDay: 18, heatThermsPerDegC: 12, heatBalanceC: 15 } },
  { meterId: "SCH-W", buildingId: "birchfield-school", commodity: "water", unit: "ccf", tariffId: "harrow-water", multiplier: 1, account: "HWB-301-0092",
    water: { baseGalPerDay: 350, occupiedGalPerDay: 2300, summerUplift: 0.1 } },
  // Millbrook Market Hall: retail, open every day.
  { meterId: "MKT-E", buildingId: "millbrook-market", commodity: "electricity", unit: "kWh", tariffId: "prairie-gs", multiplier: 1, account: "PCE-300-88412",
    electric: { baseKw: 42, occupiedKw: 105, coolKwPerC: 6.5, coolBalanceC: 15, heatKwPerC: 0, heatBalanceC: 0 },
    printsDemand: true, printsLines: true },
  { meterId: "MKT-G", buildingId: "millbrook-market", commodity: "gas", unit: "therm", tariffId: "prairie-gas", multiplier: 1, account: "PCE-300-88413",
    gas: { baseThermsPerDay: 16, heatThermsPerDegC: 6.2, heatBalanceC: 13 } },
  { meterId: "MKT-W", buildingId: "millbrook-market", commodity: "water", unit: "gal", tariffId: "prairie-water", multiplier: 1, account: "PCW-07-1144",
    water: { baseGalPerDay: 260, occupiedGalPerDay: 720, summerUplift: 0.25 } },
  // Cedar Flats: warehouse with electric unit heaters, interval data in local time.
  { meterId: "WHS-E", buildingId: "cedar-flats", commodity: "electricity", unit: "kWh", tariffId: "prairie-gs", multiplier: 1, account: "PCE-300-90127",
    electric: { baseKw: 48, occupiedKw: 118, coolKwPerC: 3.2, coolBalanceC: 20, heatKwPerC: 5.8, heatBalanceC: 8 },
    interval: { decimals: 2, layout: "local-no-offset" }, printsDemand: true },
  { meterId: "WHS-W", buildingId: "cedar-flats", commodity: "water", unit: "gal", tariffId: "prairie-water", multiplier: 1, account: "PCW-07-2290",
    water: { baseGalPerDay: 180, occupiedGalPerDay: 640, summerUplift: 0.05 } },
  // Willow Bend clinic.
  { meterId: "CLN-E", buildingId: "willow-clinic", commodity: "electricity", unit: "kWh", tariffId: "prairie-gs", multiplier: 1, account: "PCE-300-91550",
    electric: { baseKw: 22, occupiedKw: 58, coolKwPerC: 3.4, coolBalanceC: 16, heatKwPerC: 0, heatBalanceC: 0 }, printsDemand: true },
  { meterId: "CLN-G", buildingId: "willow-clinic", commodity: "gas", unit: "therm", tariffId: "prairie-gas", multiplier: 1, account: "PCE-300-91551",
    gas: { baseThermsPerDay: 11, heatThermsPerDegC: 3.1, heatBalanceC: 14 } },
  { meterId: "CLN-W", buildingId: "willow-clinic", commodity: "water", unit: "gal", tariffId: "prairie-water", multiplier: 1, account: "PCW-07-3318",
    water: { baseGalPerDay: 150, occupiedGalPerDay: 900, summerUplift: 0.06 }, printsLines: true },
  // Fenwick library: all-electric heat pumps.
  { meterId: "LIB-E", buildingId: "fenwick-library", commodity: "electricity", unit: "kWh", tariffId: "prairie-gs", multiplier: 1, account: "PCE-300-93004",
    electric: { baseKw: 19, occupiedKw: 44, coolKwPerC: 3.6, coolBalanceC: 16, heatKwPerC: 2.9, heatBalanceC: 11 }, printsDemand: true },
  { meterId: "LIB-W", buildingId: "fenwick-library", commodity: "water", unit: "gal", tariffId: "prairie-water", multiplier: 1, account: "PCW-07-4471",
    water: { baseGalPerDay: 90, occupiedGalPerDay: 520, summerUplift: 0.12 } },
];

/** Building of a meter (throws on a typo in this file, which a test covers). */
export function buildingOf(meter: MeterDef): BuildingDef {
  const b = BUILDINGS.find((x) => x.buildingId === meter.buildingId);
  if (!b) throw new Error(`demo definition: meter ${meter.meterId} names unknown building ${meter.buildingId}`);
  return b;
}

/** Station of a building. */
export function stationOf(building: BuildingDef): StationDef {
  const s = STATIONS.find((x) => x.stationId === building.stationId);
  if (!s) throw new Error(`demo definition: building ${building.buildingId} names unknown station ${building.stationId}`);
  return s;
}
