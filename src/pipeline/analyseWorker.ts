/**
 * Worker-thread entry of the analysis pool (analysisPool.ts): one building's task in, its results
 * out as plain data. Compiled beside the CLI as dist/cli/analyseWorker.js (package.json `prepare`).
 */
import { analyseTask, type BuildingTask, type PlainResults } from "./buildingTask.ts";

export default function analyse(task: BuildingTask): PlainResults {
  return analyseTask(task);
}
