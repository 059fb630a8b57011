/** RFC 4180 quoting (the rules of RFC 4180 section 2, items 5–7). */
import { describe, expect, it } from "vitest";
import { csvField, toCsv } from "../../src/core/csv.ts";

describe("csv", () => {
  it("quotes fields with commas, quotes and line breaks, doubling quotes", () => {
    expect(csvField("a,b")).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField("two\nlines")).toBe('"two\nlines"');
    expect(csvField("plain")).toBe("plain");
  });

  it("writes empty cells for null, undefined and non-finite numbers", () => {
    expect(csvField(null)).toBe("");
    expect(csvField(undefined)).toBe("");
    expect(csvField(Number.NaN)).toBe("");
    expect(csvField(12.5)).toBe("12.5");
  });

  it("keeps the header order and fills missing columns with empty cells", () => {
    expect(toCsv(["a", "b"] as const, [{ a: 1, b: "x,y" }, { a: 2 } as { a: number; b?: string }])).toBe('a,b\n1,"x,y"\n2,\n');
  });
});
