/** Small invented fixtures for the forecast tests. */
import type { Bill, Meter } from "../../src/domain/types.ts";
import { loadTariff, type Tariff } from "../../src/tariff/index.ts";

export function tariffFrom(yaml: string): Tariff {
  const { tariff, issues } = loadTariff(yaml, "test.yaml");
  if (!tariff) throw new Error(`test tariff did not load: ${issues.map((i) => i.message).join("; ")}`);
  return tariff;
}

/** Customer charge 10, blocks 0.10 up to 100 then 0.05, demand 5 per kW; one version from 2020. */
export const BLOCK_DEMAND_YAML = `
id: t-blocks
name: Test blocks and demand
commodity: electricity
usage_unit: kWh
currency: USD
versions:
  - from: 2020-01-01
    charges:
      - label: Customer charge
        fixed: 10
      - label: Energy
        blocks:
          - { up_to: 100, rate: 0.10 }
          - { rate: 0.05 }
      - label: Demand
        demand: 5
`;

export function meter(overrides: Partial<Meter> = {}): Meter {
  return {
    meterId: "M1",
    buildingId: "B1",
    commodity: "electricity",
    unit: "kWh",
    tariffId: "t-blocks",
    multiplier: 1,
    account: null,
    source: { file: "meters.csv", line: 2 },
    ...overrides,
  };
}

export function bill(periodStart: string, periodEnd: string, usage: number, total: number, extra: Partial<Bill> = {}): Bill {
  return {
    billId: `M1:${periodStart}`,
    meterId: "M1",
    periodStart,
    periodEnd,
    usage,
    readType: "actual",
    demandKw: null,
    powerFactor: null,
    total,
    statementDate: null,
    source: { file: "bills.csv", line: 2 },
    ...extra,
  };
}

/** One bill per calendar month of `year`, each with the given usage and total. */
export function calendarBills(year: number, usage: (month: number) => number, total: (month: number) => number): Bill[] {
  const out: Bill[] = [];
  for (let m = 1; m <= 12; m++) {
    const start = `${year}-${String(m).padStart(2, "0")}-01`;
    const end = m === 12 ? `${year + 1}-01-01` : `${year}-${String(m + 1).padStart(2, "0")}-01`;
    out.push(bill(start, end, usage(m), total(m)));
  }
  return out;
}
