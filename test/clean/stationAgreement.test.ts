/**
 * Agreement across meters on one weather station (issue 12, item 7), on invented offices sharing
 * one station (alignmentSynthetic.ts, seeded). Expected values are the planted offsets.
 */
import { describe, expect, it } from "vitest";
import { suggestAlignment } from "../../src/clean/alignment.ts";
import { stationAgreement } from "../../src/clean/stationAgreement.ts";
import { ALIGN_ZONE, officeOnStation, seasonWeather } from "./alignmentSynthetic.ts";

describe("stationAgreement", () => {
  const weather = seasonWeather("cooling", 3);
  const scan = (offsetHours: number, scale: number, w = weather) =>
    suggestAlignment(officeOnStation(weather, { season: "cooling", seed: 3, offsetHours, lagHours: 0, scale, meterId: `M${scale}` }), w, ALIGN_ZONE);

  it("a late meter among neighbours in step with the weather keeps its strong +3 h, and says they agree", () => {
    const out = stationAgreement([0.8, 1, 1.3].map((scale, k) => ({ stationId: "WX-A", suggestion: scan(k === 1 ? 3 : 0, scale) })));
    expect(out[1]!.suggestedOffsetHours).toBe(3);
    expect(out[1]!.strong).toBe(true);
    expect(out[1]!.evidence.note).toMatch(/2 of 2 other meters on station WX-A respond from 0 h/);
    expect(out[0]!.strong).toBe(true);
  });

  it("when the weather file itself is 2 h off, every meter looks 2 h early, and none is called strong", () => {
    // weather stamped 2 h late: the same temperatures two hours later on the clock
    const shifted = { ...weather, startMs: weather.startMs + 2 * 3_600_000 };
    const scans = [0.8, 1, 1.3].map((scale) => ({ stationId: "WX-A", suggestion: scan(0, scale, shifted) }));
    for (const s of scans) expect(s.suggestion.suggestedOffsetHours).toBe(-2);
    const out = stationAgreement(scans);
    for (const s of out) {
      expect(s!.strong).toBe(false);
      expect(s!.evidence.note).toMatch(/weather's own timestamps may be off/);
    }
  });

  it("one or no neighbour: the meter's own evidence stands", () => {
    const a = scan(0, 1);
    expect(stationAgreement([{ stationId: "W", suggestion: a }, { stationId: "W", suggestion: null }])[0]).toBe(a);
  });
});
