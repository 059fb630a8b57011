import type { AlignmentSuggestion } from "./alignment.ts";

/**
 * Agreement with the other meters on the same weather station, the last check before an offset
 * may be called strong. The weather's own clock is shared: when most of the other meters on the
 * station (at least two with a readable response onset) begin responding to temperature at the
 * same non-zero hour, the weather file is the likelier culprit, and no meter of the station keeps
 * a strong call. Otherwise the suggestion stands, and the note says how many neighbours agree
 * with the weather. Returns new suggestions (the inputs are not changed), in input order.
 * @example stationAgreement([{ stationId: "W", suggestion: a }, …]) // a.strong unchanged when peers read 0
 */
export function stationAgreement(
  meters: ReadonlyArray<{ stationId: string; suggestion: AlignmentSuggestion | null }>,
): Array<AlignmentSuggestion | null> {
  return meters.map(({ stationId, suggestion }, k) => {
    if (!suggestion) return null;
    const peers = meters
      .filter((m, j) => j !== k && m.stationId === stationId && m.suggestion?.evidence.onsetOffsetHours != null)
      .map((m) => m.suggestion!.evidence.onsetOffsetHours!);
    if (peers.length < 2) return suggestion;
    const sorted = [...peers].sort((a, b) => a - b);
    const median = sorted[Math.floor(sorted.length / 2)]!;
    const atMedian = peers.filter((p) => p === median).length;
    if (median !== 0 && atMedian * 2 > peers.length) {
      return {
        ...suggestion,
        strong: false,
        evidence: {
          ...suggestion.evidence,
          note: `${suggestion.evidence.note}; ${atMedian} of ${peers.length} other meters on station ${stationId} also respond from ${median} h, so the weather's own timestamps may be off: no offset is called strong`,
        },
      };
    }
    const agreeing = peers.filter((p) => p === 0).length;
    return { ...suggestion, evidence: { ...suggestion.evidence, note: `${suggestion.evidence.note}; ${agreeing} of ${peers.length} other meters on station ${stationId} respond from 0 h (in step with the weather)` } };
  });
}
