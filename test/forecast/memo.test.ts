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
});
