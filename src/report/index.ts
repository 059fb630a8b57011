/** The report stage: pipeline results → page view models. */
export type * from "./input.ts";
export type * from "./siteModel.ts";
export { buildSiteModel, siteModelInParts, tenantSiteModel, type SiteModelInParts } from "./buildSiteModel.ts";
export { rowsByBuilding, type BuildingSlice } from "./buildingSlice.ts";
export { describeDataFiles, describeDataFile, formatBytes, DATA_FILE_DESCRIPTIONS } from "./dataPage.ts";
export { jsonForScript, scriptSafeJson } from "./format.ts";

// Used by other folders (see test/architecture/layers.test.ts).
export { buildDataFiles, dataFileEntries } from "./dataFiles.ts";
export { buildingDataFolder } from "./dataPage.ts";
export { toReportInput } from "./fromAnalysis.ts";
export type { BuildingResults, HourlyModelOutcome } from "./fromAnalysis.ts";
export { effectiveAsOf } from "./usageSummary.ts";
