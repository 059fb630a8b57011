/**
 * The one place where the demo generator calls the project's tariff engine. Every bill total
 * and every printed line in the demo comes from here, so clean bills re-price exactly.
 */
import { loadTariff } from "../../src/tariff/load.ts";
import { priceBill } from "../../src/tariff/price.ts";
import type { ComputedBill, PriceRequest } from "../../src/tariff/types.ts";
import type { TariffFile } from "./tariffs.ts";

export type DemoTariff = NonNullable<ReturnType<typeof loadTariff>["tariff"]>;

/** Parses a demo tariff file; any issue is a bug in the demo, so it throws. */
export function loadDemoTariff(file: TariffFile): DemoTariff {
  const { tariff, issues } = loadTariff(file.text, `tariffs/${file.fileName}`);
  if (!tariff || issues.some((i) => i.severity === "error")) {
    throw new Error(`demo tariff ${file.fileName} does not load: ${issues.map((i) => i.message).join("; ")}`);
  }
  return tariff;
}

/** Prices one demo bill with the project's engine. */
export function priceDemoBill(tariff: DemoTariff, request: PriceRequest): ComputedBill {
  return priceBill(tariff, request);
}
