/** The pipeline sequences the stages; the CLI reaches it only through this file. */
export { buildPortfolioSite, analyseBuilding, type BuildOptions, type BuildResult, type BuildSummary } from "./build.ts";
export { silentReporter, type Reporter } from "./reporter.ts";
export { defaultCacheDir } from "./analysisCache.ts";
