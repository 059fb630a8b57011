import { describe, expect, it } from "vitest";
import { DateTime } from "luxon";
import { LocalTimeResolver } from "../../../src/core/time/index.ts";

describe("LocalTimeResolver agrees with luxon at every 45 minutes of 2024 (all quarter-hour minutes hit) (reference: luxon, one call per row)", () => {
  for (const zone of ["America/New_York", "Europe/Berlin", "Australia/Lord_Howe", "Asia/Kolkata", "UTC"]) {
    it(zone, () => {
      const r = new LocalTimeResolver(zone);
      let mismatches = 0;
      let prev = Number.NaN;
      for (let wall = Date.UTC(2024, 0, 1); wall < Date.UTC(2025, 0, 1); wall += 45 * 60000) {
        const d = new Date(wall);
        const dt = DateTime.fromObject(
          { year: d.getUTCFullYear(), month: d.getUTCMonth() + 1, day: d.getUTCDate(), hour: d.getUTCHours(), minute: d.getUTCMinutes() },
          { zone },
        );
        const got = r.resolve(wall, prev);
        // luxon moves a skipped wall time forward; there the resolver must say "nonexistent".
        const exists = dt.hour === d.getUTCHours() && dt.minute === d.getUTCMinutes();
        if (!exists) {
          if (!Number.isNaN(got)) mismatches++;
          continue;
        }
        // In a repeated hour luxon picks one of the two; accept either, as long as it is a real reading of that wall time.
        if (r.kind === "repeated") {
          if (DateTime.fromMillis(got, { zone }).toFormat("HH:mm") !== dt.toFormat("HH:mm")) mismatches++;
        } else if (got !== dt.toMillis()) mismatches++;
        prev = got;
      }
      expect(mismatches).toBe(0);
    });
  }

  it("Lord Howe's half-hour change (2024-04-07 02:00 → 01:30) repeats 01:30–01:59 only", () => {
    const r = new LocalTimeResolver("Australia/Lord_Howe");
    const a = r.resolve(Date.UTC(2024, 3, 7, 1, 45), Number.NaN);
    expect(r.kind).toBe("repeated");
    const b = r.resolve(Date.UTC(2024, 3, 7, 1, 45), a);
    expect(b - a).toBe(30 * 60000);
    r.resolve(Date.UTC(2024, 3, 7, 1, 15), Number.NaN);
    expect(r.kind).toBe("unique");
  });
});
