/**
 * Issue 17, "incremental rebuild": the forecast keeps each meter's backtest paths and forecast
 * in a memo (a build's cache); run again on the same inputs it computes nothing and gives the
 * same bundle, and after one bill changes it recomputes only what depends on that meter.
 * (Synthetic portfolio on real NOAA Seattle temperatures, invented meters and prices.)
 */
import { describe, expect, it } from "vitest";
import { serialize, deserialize } from "node:v8";
import { forecastWithTrackRecord } from "../../src/forecast/index.ts";
import { SYNTHETIC_AS_OF, syntheticForecastPortfolio } from "../../bench/lib/forecastPortfolio.ts";
import { contentHash } from "../../src/core/contentHash.ts";
import type { Memo } from "../../src/core/memo.ts";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { loadPortfolio } from "../../src/ingest/index.ts";
import { IntervalShelf } from "../../src/pipeline/intervalShelf.ts";
import type { IntervalSeries, Portfolio } from "../../src/domain/types.ts";
import type { Tariff } from "../../src/tariff/index.ts";

/** A memo that keeps serialized results, as the build's cache does, and counts what it computes. */
function keepingMemo() {
  const kept = new Map<string, Buffer>();
  const computed: string[] = [];
  const memo: Memo = (kind, inputs, compute) => {
    const key = `${kind}:${contentHash(inputs)}`;
    if (!kept.has(key)) {
      computed.push(kind);
      kept.set(key, serialize(compute()));
    }
    return deserialize(kept.get(key)!) as ReturnType<typeof compute>;
  };
  return { memo, computed };
}

describe("forecast memo", () => {
  it("gives the bundle a run without it gives, computes nothing the second time, and only the changed meter's parts after a bill changes", () => {
    const portfolio = syntheticForecastPortfolio("seattle");
    const options = { asOf: SYNTHETIC_AS_OF, months: 12, scenarios: 60 };
    const without = forecastWithTrackRecord(portfolio, options);
    const { memo, computed } = keepingMemo();
    const first = forecastWithTrackRecord(portfolio, { ...options, memo });
    expect(contentHash(first)).toBe(contentHash(without));
    const meters = portfolio.meters.length;
    expect(computed.filter((k) => k === "forecast-meter")).toHaveLength(meters);
    expect(computed.filter((k) => k === "change-point-choice").length).toBeGreaterThan(0);

    computed.length = 0;
    const second = forecastWithTrackRecord(portfolio, { ...options, memo });
    expect(computed).toEqual([]);
    expect(contentHash(second)).toBe(contentHash(without));

    // One bill of one meter changes (its total by a cent): only that meter's parts are computed again.
    const target = portfolio.bills[portfolio.bills.length - 1]!;
    const changed = { ...portfolio, bills: portfolio.bills.map((b) => (b === target ? { ...b, total: b.total + 0.01 } : b)) };
    const third = forecastWithTrackRecord(changed, { ...options, memo });
    expect(computed.filter((k) => k === "forecast-meter")).toEqual(["forecast-meter"]);
    expect(contentHash(third)).toBe(contentHash(forecastWithTrackRecord(changed, options)));
  }, 300_000);

  it("keys a meter's forecast on its readings' digest (the build's interval shelf): one reading changed recomputes that meter's forecast, and only its", async () => {
    const demo = (await loadPortfolio("data/demo")).portfolio as Portfolio<Tariff>;
    const shelves: IntervalShelf[] = [];
    const onShelf = (intervals: ReadonlyMap<string, IntervalSeries>): Portfolio<Tariff> => {
      shelves.push(IntervalShelf.fill(mkdtempSync(join(tmpdir(), "ohmbook-memo-test-")), intervals));
      return { ...demo, intervals: shelves.at(-1)! };
    };
    const options = { asOf: "2025-12-31", months: 12, scenarios: 30 };
    const { memo, computed } = keepingMemo();
    forecastWithTrackRecord(onShelf(demo.intervals), { ...options, memo });

    // One reading of one meter, early enough to be seen at every backtest origin, up by 1 %.
    const [meterId, series] = [...demo.intervals].find(([id]) => demo.bills.some((b) => b.meterId === id))!;
    const values = Float64Array.from(series.values);
    values[96] = values[96]! * 1.01 + 1;
    const changed = new Map(demo.intervals).set(meterId, { ...series, values });
    computed.length = 0;
    const again = forecastWithTrackRecord(onShelf(changed), { ...options, memo });
    expect(computed.filter((k) => k === "forecast-meter")).toEqual(["forecast-meter"]);
    expect(computed.filter((k) => k.startsWith("backtest-")).length).toBeGreaterThan(0);
    expect(contentHash(again)).toBe(contentHash(forecastWithTrackRecord({ ...demo, intervals: changed }, options)));

    // The same readings shelved again: nothing to compute.
    computed.length = 0;
    forecastWithTrackRecord(onShelf(changed), { ...options, memo });
    expect(computed).toEqual([]);
    for (const shelf of shelves) shelf.dispose();
  }, 300_000);
});
