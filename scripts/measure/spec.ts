import { loadPortfolio } from "../../src/ingest/index.ts";
import { assessIntervalMeters } from "../../src/pipeline/dataQuality.ts";
const p = (await loadPortfolio("test/fixtures/spec-portfolio")).portfolio!;
const q = assessIntervalMeters(p);
for (const m of q.meters) for (const d of m.detections) console.log(m.meterId, d.kind, new Date(d.startMs).toISOString(), d.intervals, d.detail);
