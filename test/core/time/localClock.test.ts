import { TimeInputError } from "../../../src/core/errors.ts";
import { describe, expect, it } from "vitest";
import { localClockMs } from "../../../src/core/time/index.ts";

describe("localClockMs (IANA zone rules: US DST began 2025-03-09 at 02:00 local)", () => {
  it("EST (UTC−5) before the change, EDT (UTC−4) after, within the same UTC day", () => {
    const before = Date.UTC(2025, 2, 9, 6, 59); // 01:59 EST
    const after = Date.UTC(2025, 2, 9, 7, 0); // 03:00 EDT
    const [a, b] = localClockMs([before, after], "America/New_York");
    expect(new Date(a!).toISOString()).toBe("2025-03-09T01:59:00.000Z");
    expect(new Date(b!).toISOString()).toBe("2025-03-09T03:00:00.000Z");
  });
  it("without a zone the instants come back as UTC; an unknown zone is a TimeInputError", () => {
    expect(Array.from(localClockMs([5, 6]))).toEqual([5, 6]);
    expect(() => localClockMs([0], "Nowhere/Town")).toThrow(TimeInputError);
  });
});
