/** The report stage: pipeline results → page view models. */
export type * from "./input.ts";
export type * from "./siteModel.ts";
export { buildSiteModel, siteModelInParts, tenantSiteModel, type SiteModelInParts } from "./buildSiteModel.ts";
export { describeDataFiles, describeDataFile, formatBytes, DATA_FILE_DESCRIPTIONS } from "./dataPage.ts";
export { jsonForScript } from "./format.ts";
