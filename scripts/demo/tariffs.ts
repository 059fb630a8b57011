/**
 * The demo's tariff files, as YAML text written the way a person would transcribe a rate
 * sheet. Utilities and rates are invented.
 */

export interface TariffFile {
  id: string;
  /** File name under tariffs/. */
  fileName: string;
  text: string;
}

const HARROW_GS_TOU = `# Invented rate sheet: Harrow Valley Power & Gas, Large General Service.
# Time-of-use energy and a summer on-peak demand charge start with the 2024-10-01 filing;
# the 2025-07-01 settlement lowered the energy rates and the purchased power adjustment.
id: harrow-gs-tou
name: Harrow Valley Power & Gas, Large General Service (Rate LGS)
commodity: electricity
usage_unit: kWh
currency: USD

versions:
  - from: 2022-01-01
    charges:
      - label: Customer charge
        fixed: 185.00
      - label: Energy
        energy: 0.0912
      - label: Purchased power adjustment
        energy: 0.0148
      - label: Distribution demand
        demand: 11.40
        window_minutes: 15
        ratchet: { percent: 80, months: 11 }
        minimum_kw: 50
      - label: Power factor adjustment
        power_factor: { target: 0.90 }
      - label: Sales tax
        percent: 4.5
        of: all

  - from: 2024-10-01
    seasons:
      summer: Jun-Sep
      winter: Oct-May
    holidays: us-federal
    periods:
      on-peak:
        season: summer
        days: weekdays
        hours: "13:00-19:00"
      mid-peak:
        days: weekdays
        hours: ["08:00-13:00", "19:00-21:00"]
      off-peak: {}
    charges:
      - label: Customer charge
        fixed: 195.00
      - label: Energy
        energy:
          on-peak: 0.1584
          mid-peak: 0.1037
          off-peak: 0.0716
      - label: Purchased power adjustment
        energy: 0.0162
      - label: Distribution demand
        demand: 11.95
        window_minutes: 15
        ratchet: { percent: 80, months: 11 }
        minimum_kw: 50
      - label: Summer on-peak demand
        demand: { on-peak: 6.80 }
      - label: Power factor adjustment
        power_factor: { target: 0.90 }
      - label: Sales tax
        percent: 4.5
        of: all

  - from: 2025-07-01
    inherit: true
    charges_override:
      - label: Energy
        energy: { on-peak: 0.1519, mid-peak: 0.0988, off-peak: 0.0684 }
      - label: Purchased power adjustment
        energy: 0.0139
`;

const HARROW_SC = `# Invented rate sheet: Harrow Valley Power & Gas, Small Commercial Service.
id: harrow-sc
name: Harrow Valley Power & Gas, Small Commercial Service (Rate SC-2)
commodity: electricity
usage_unit: kWh
currency: USD

versions:
  - from: 2022-01-01
    charges:
      - label: Customer charge
        fixed: 38.00
      - label: Delivery
        blocks:
          - { up_to: 2000, rate: 0.0842 }
          - { up_to: 20000, rate: 0.0671 }
          - { rate: 0.0545 }
        scale_blocks_by_days: true
      - label: Supply
        energy: 0.0968
      - label: Purchased power adjustment
        energy: 0.0148
      - label: Sales tax
        percent: 4.5
  - from: 2024-10-01
    inherit: true
    charges_override:
      - label: Purchased power adjustment
        energy: 0.0162
  - from: 2025-07-01
    inherit: true
    charges_override:
      - label: Supply
        energy: 0.1012
      - label: Purchased power adjustment
        energy: 0.0139
`;

const HARROW_GAS = `# Invented rate sheet: Harrow Valley Power & Gas, Commercial Gas Service.
# Rates are per therm; meters read in ccf are converted with the heat content below.
id: harrow-gas
name: Harrow Valley Power & Gas, Commercial Gas Service (Rate G-4)
commodity: gas
usage_unit: therm
currency: USD
heat_content: 1.041

versions:
  - from: 2022-01-01
    charges:
      - label: Customer charge
        fixed: 42.00
      - label: Distribution
        blocks:
          - { up_to: 500, rate: 0.4120 }
          - { up_to: 5000, rate: 0.2870 }
          - { rate: 0.1930 }
      - label: Gas supply
        energy: 0.6150
      - label: Sales tax
        percent: 4.5
  - from: 2024-11-01
    inherit: true
    charges_override:
      - label: Gas supply
        energy: 0.5480
`;

const HARROW_WATER = `# Invented rate sheet: Harrow Valley Water Board, non-residential water and sewer.
id: harrow-water
name: Harrow Valley Water Board, Non-residential Water and Sewer
commodity: water
usage_unit: ccf
currency: USD

versions:
  - from: 2022-01-01
    charges:
      - label: Base service charge
        fixed: 24.00
      - label: Water
        blocks:
          - { up_to: 100, rate: 5.12 }
          - { up_to: 1000, rate: 4.46 }
          - { rate: 3.98 }
      - label: Sewer
        energy: 6.35
  - from: 2025-01-01
    inherit: true
    charges_override:
      - label: Sewer
        energy: 6.72
`;

const PRAIRIE_GS = `# Invented rate sheet: Prairie Crossing Energy Cooperative, General Service with Demand.
id: prairie-gs
name: Prairie Crossing Energy Cooperative, General Service with Demand (GS-D)
commodity: electricity
usage_unit: kWh
currency: USD

versions:
  - from: 2022-01-01
    charges:
      - label: Customer charge
        fixed: 62.50
      - label: Energy
        blocks:
          - { up_to: 10000, rate: 0.0934 }
          - { up_to: 50000, rate: 0.0788 }
          - { rate: 0.0661 }
      - label: Demand charge
        demand: 9.25
        minimum_kw: 20
      - label: Energy cost adjustment
        energy: 0.0072
      - label: Franchise fee
        percent: 3.0
        of: [Customer charge, Energy, Demand charge]
      - label: Sales tax
        percent: 6.25
    minimum_bill: 75.00
  - from: 2025-01-01
    inherit: true
    charges_override:
      - label: Energy cost adjustment
        energy: 0.0094
`;

const PRAIRIE_GAS = `# Invented rate sheet: Prairie Crossing Energy Cooperative, Commercial Gas.
id: prairie-gas
name: Prairie Crossing Energy Cooperative, Commercial Gas (CG-1)
commodity: gas
usage_unit: therm
currency: USD

versions:
  - from: 2022-01-01
    charges:
      - label: Customer charge
        fixed: 28.00
      - label: Distribution
        blocks:
          - { up_to: 300, rate: 0.3860 }
          - { rate: 0.2410 }
      - label: Gas supply
        energy: 0.5720
      - label: Sales tax
        percent: 6.25
`;

const PRAIRIE_WATER = `# Invented rate sheet: City of Prairie Crossing water and sewer, per gallon.
id: prairie-water
name: Prairie Crossing Municipal Water, Commercial Water and Sewer
commodity: water
usage_unit: gal
currency: USD

versions:
  - from: 2022-01-01
    charges:
      - label: Meter charge
        fixed: 18.75
      - label: Water
        energy: 0.00612
      - label: Sewer
        energy: 0.00745
    minimum_bill: 30.00
`;

/** All tariff files of the demo. */
export const TARIFF_FILES: TariffFile[] = [
  { id: "harrow-gs-tou", fileName: "harrow-gs-tou.yaml", text: HARROW_GS_TOU },
  { id: "harrow-sc", fileName: "harrow-sc.yaml", text: HARROW_SC },
  { id: "harrow-gas", fileName: "harrow-gas.yaml", text: HARROW_GAS },
  { id: "harrow-water", fileName: "harrow-water.yaml", text: HARROW_WATER },
  { id: "prairie-gs", fileName: "prairie-gs.yaml", text: PRAIRIE_GS },
  { id: "prairie-gas", fileName: "prairie-gas.yaml", text: PRAIRIE_GAS },
  { id: "prairie-water", fileName: "prairie-water.yaml", text: PRAIRIE_WATER },
];

/**
 * The large-service tariff as it stood before the 2025-07-01 filing (last version removed):
 * used only to plant the "billed on the old rate" problem.
 */
export function harrowGsTouWithoutLastVersion(): TariffFile {
  const cut = HARROW_GS_TOU.indexOf("  - from: 2025-07-01");
  return { id: "harrow-gs-tou", fileName: "harrow-gs-tou.yaml", text: HARROW_GS_TOU.slice(0, cut) };
}
