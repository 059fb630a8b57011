/** Converters from outside formats into a portfolio folder (today: ESPI / Green Button XML). */
export { importEspi } from "./espi/importEspi.ts";
