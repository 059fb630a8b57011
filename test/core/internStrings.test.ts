import { describe, expect, it } from "vitest";
import { internStrings } from "../../src/core/internStrings.ts";

describe("internStrings", () => {
  it("leaves every value as it was, through objects, arrays and Map values, and records each distinct text once", () => {
    const make = () => ({
      status: "exact",
      lines: [{ status: "exact", unit: "kWh", notes: ["Each line is rounded."] }, { status: "estimated", unit: "kWh", notes: [] }],
      byBill: new Map<string, unknown>([["b1", { unit: "kWh" }], ["b2", "exact"]]),
      numbers: new Float64Array([1, 2]),
      when: new Date(0),
      tags: new Set(["kept as is"]),
      nothing: null,
    });
    const table = new Map<string, string>();
    const value = internStrings(structuredClone(make()), table);
    expect(value).toEqual(make());
    expect([...table.keys()].sort()).toEqual(["Each line is rounded.", "estimated", "exact", "kWh"]);
  });
});
