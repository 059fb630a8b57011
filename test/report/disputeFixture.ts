/**
 * Hand-made disputes over the report fixture's buildings (test/report/fixture.ts), for the
 * dispute list and claim sheet tests. Invented numbers; each claim = billed − corrected to the cent.
 */
import type { Dispute, DisputeBill, DisputeLine } from "../../src/disputes/types.ts";

function line(label: string, printed: number | null, corrected: number | null, quantity: number | null, unit: string, rate: number | null, note: string | null = null): DisputeLine {
  return {
    label,
    printed,
    corrected,
    difference: printed != null && corrected != null ? Math.round((printed - corrected) * 100) / 100 : null,
    quantity,
    unit,
    rate,
    note,
    status: corrected == null ? null : "exact",
  };
}

function bill(over: Partial<DisputeBill> & Pick<DisputeBill, "billId" | "periodStart" | "periodEnd" | "billedTotal" | "correctedTotal">): DisputeBill {
  return {
    claimAmount: Math.round((over.billedTotal - over.correctedTotal) * 100) / 100,
    readType: "actual",
    usageUnit: "kWh",
    billedUsage: 10_000,
    meteredUsage: null,
    correctedUsage: 10_000,
    billedDemandKw: null,
    meteredDemandKw: null,
    correctedDemandKw: null,
    tariffId: "T-electricity",
    versions: [{ from: "2023-01-01", days: 31, weight: 1 }],
    lines: [],
    notes: [],
    correctedOn: "the usage printed on the bill",
    ...over,
  };
}

function dispute(over: Partial<Dispute> & Pick<Dispute, "disputeId" | "buildingId" | "meterId" | "billedTotal" | "correctedTotal" | "kind" | "basis">): Dispute {
  return {
    account: null,
    billIds: [],
    periodStart: "2024-05-05",
    periodEnd: "2024-06-05",
    checks: ["total-mismatch"],
    severity: "error",
    claimAmount: Math.round((over.billedTotal - over.correctedTotal) * 100) / 100,
    correctedRange: null,
    title: "Bill total differs from the tariff",
    explanation: "The bill is higher than its tariff gives.",
    bills: [],
    relatedBillIds: [],
    notes: [],
    ...over,
  };
}

/** A multiplier claim on the building whose name is an injection attempt. */
export const MULTIPLIER_CLAIM: Dispute = dispute({
  disputeId: "D-E2-2024-08",
  buildingId: "B2",
  meterId: "E2",
  account: "ACC-<7>&\"9\"",
  billIds: ["E2-08", "E2-09"],
  periodStart: "2024-08-05",
  periodEnd: "2024-10-05",
  checks: ["multiplier-suspect", "usage-vs-meter", "total-mismatch"],
  basis: "multiplier",
  kind: "claim",
  billedTotal: 49_935.66,
  correctedTotal: 24_967.83,
  title: "Billed usage is twice what the meter recorded",
  explanation: "Usage and demand on both bills are exactly 2 × the interval data.",
  bills: [
    bill({
      billId: "E2-08",
      periodStart: "2024-08-05",
      periodEnd: "2024-09-05",
      billedTotal: 24_967.83,
      correctedTotal: 12_483.92,
      billedUsage: 200_000,
      meteredUsage: 100_000,
      correctedUsage: 100_000,
      billedDemandKw: 400,
      meteredDemandKw: 200,
      correctedDemandKw: 200,
      correctedOn: "metered usage and demand (interval data, multiplier 1)",
      lines: [
        line("Customer charge", 25, 25, 1, "bill", 25),
        line("Energy", 24_942.83, 12_458.92, 100_000, "kWh", 0.1245892, "flat rate"),
      ],
      notes: ["Usage converted from interval data over the local service period."],
    }),
    bill({ billId: "E2-09", periodStart: "2024-09-05", periodEnd: "2024-10-05", billedTotal: 24_967.83, correctedTotal: 12_483.91 }),
  ],
  notes: ["Absorbed: usage against the meter, total mismatch."],
});

/** A printed line at the wrong tax rate. */
export const LINE_CLAIM: Dispute = dispute({
  disputeId: "D-E1-05",
  buildingId: "B1",
  meterId: "E1",
  account: "100-200",
  billIds: ["E1-05"],
  checks: ["line-mismatch", "total-mismatch"],
  basis: "tariff",
  kind: "claim",
  billedTotal: 3_651.6,
  correctedTotal: 3_580,
  title: "Sales tax charged at the wrong rate",
  explanation: "The sales tax line is 7.25 % instead of 6.25 %.",
  bills: [
    bill({
      billId: "E1-05",
      periodStart: "2024-05-05",
      periodEnd: "2024-06-05",
      billedTotal: 3_651.6,
      correctedTotal: 3_580,
      lines: [line("Energy", 3_369.33, 3_369.33, 30_000, "kWh", 0.112311), line("Sales tax", 282.27, 210.67, null, "", null, "6.25 % of 3,369.33"), line("Meter access fee", 0, null, null, "", null)],
    }),
  ],
  relatedBillIds: ["E1-04"],
});

/** A bill paid twice. */
export const DUPLICATE_CLAIM: Dispute = dispute({
  disputeId: "D-G1-dup",
  buildingId: "B1",
  meterId: "G1",
  billIds: ["G1-06-R"],
  checks: ["duplicate-bill"],
  basis: "duplicate",
  kind: "claim",
  billedTotal: 826.9,
  correctedTotal: 0,
  title: "The same bill was issued twice",
  explanation: "A second bill repeats the period, usage and total of G1-06.",
  bills: [bill({ billId: "G1-06-R", periodStart: "2024-06-05", periodEnd: "2024-07-05", billedTotal: 826.9, correctedTotal: 0, usageUnit: "therm", billedUsage: 900, correctedUsage: 0 })],
  relatedBillIds: ["G1-06"],
});

/** A period no bill covers: a budget risk, not a claim. */
export const GAP_RISK: Dispute = dispute({
  disputeId: "D-E1-gap",
  buildingId: "B1",
  meterId: "E1",
  billIds: [],
  periodStart: "2024-08-05",
  periodEnd: "2024-09-05",
  checks: ["period-gap"],
  basis: "gap",
  kind: "back-bill-risk",
  severity: "warning",
  billedTotal: 0,
  correctedTotal: 5_693.48,
  correctedRange: { low: 5_100.12, high: 6_301.9 },
  title: "No bill covers Aug 5 – Sep 4, 2024",
  explanation: "The days between two bills were never billed.",
  relatedBillIds: ["E1-07", "E1-09"],
});

/** A bill slightly too low. */
export const LOW_RISK: Dispute = dispute({
  disputeId: "D-E2-low",
  buildingId: "B2",
  meterId: "E2",
  billIds: ["E2-03"],
  basis: "tariff",
  kind: "back-bill-risk",
  severity: "warning",
  billedTotal: 1_000,
  correctedTotal: 1_012.34,
  title: "Bill total is below the tariff",
});

/** The five above, in no particular order. */
export function disputeFixture(): Dispute[] {
  return structuredClone([LOW_RISK, LINE_CLAIM, GAP_RISK, MULTIPLIER_CLAIM, DUPLICATE_CLAIM]);
}

/** `n` small claims of 1.01, 2.02, … on meter E1 (for the index's top-10 cut). */
export function manyClaims(n: number): Dispute[] {
  return Array.from({ length: n }, (_, i) =>
    dispute({
      disputeId: `D-many-${i + 1}`,
      buildingId: "B1",
      meterId: "E1",
      billIds: [`E1-${String(i + 1).padStart(2, "0")}`],
      basis: "tariff",
      kind: "claim",
      billedTotal: 100 + (i + 1) * 1.01,
      correctedTotal: 100,
    }),
  );
}
