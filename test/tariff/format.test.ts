import { describe, expect, it } from "vitest";
import { groupedNumber } from "../../src/tariff/format.ts";

describe("groupedNumber", () => {
  it("groups thousands and trims to the given decimals", () => {
    expect(groupedNumber(1583.333333)).toBe("1,583.3333");
    expect(groupedNumber(-1234567.5, 2)).toBe("-1,234,567.5");
    expect(groupedNumber(999)).toBe("999");
    expect(groupedNumber(0.0000001)).toBe("0");
  });
});
