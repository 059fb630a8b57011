import { describe, expect, it } from "vitest";
import { groupBy } from "../../src/core/groupBy.ts";

describe("groupBy", () => {
  it("groups in one pass, each group in the items' order, leaving out items without a key", () => {
    const rows = [{ id: 1, m: "E1" }, { id: 2, m: "G1" }, { id: 3, m: undefined }, { id: 4, m: "E1" }];
    const groups = groupBy(rows, (r) => r.m);
    expect([...groups.keys()]).toEqual(["E1", "G1"]);
    expect(groups.get("E1")!.map((r) => r.id)).toEqual([1, 4]);
    expect(groups.get("G1")!.map((r) => r.id)).toEqual([2]);
  });
});
