/**
 * The dispute list: money findings turned into claims and back-billing risks.
 *
 *   buildDisputes(input)   -> Dispute[]           (./buildDisputes.ts)
 *   disputesCsv(d)         -> disputes.csv text     (./output.ts)
 *   disputesJson(d)        -> disputes.json objects (./output.ts)
 */
export * from "./types.ts";
export { buildDisputes, BASIS_OF_CHECK, type DisputeInput } from "./buildDisputes.ts";
export { disputesCsv, disputesJson, disputeRows, DISPUTES_CSV_COLUMNS } from "./output.ts";
