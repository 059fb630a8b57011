/** The pipeline sequences the stages; the CLI reaches it only through this file. */
export { buildPortfolioSite, buildShard, mergeShards, type ShardOptions, type ShardResult, analyseBuilding, type BuildOptions, type BuildResult, type BuildSummary } from "./build.ts";
export { silentReporter, type Reporter } from "./reporter.ts";
export { defaultCacheDir } from "./analysisCache.ts";
export { parseShard, type ShardSpec } from "./shards.ts";
