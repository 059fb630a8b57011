/**
 * CSV downloads are safe to open in a spreadsheet (issue 16, item 5).
 * Source of the rule: OWASP, "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection):
 * cells beginning with = + - @ tab (0x09) or carriage return (0x0D) are prefixed with a single
 * quote so they are shown as text. Numbers stay numbers (the project's own requirement: money
 * amounts such as -12.50 must remain usable in sums).
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { csvField, neutraliseFormula, toCsv } from "../../src/core/csv.ts";

describe("csvField: formula neutralising (OWASP)", () => {
  it.each([
    ["=HYPERLINK(\"http://x\",\"y\")", "\"'=HYPERLINK(\"\"http://x\"\",\"\"y\"\")\""],
    ["@N1-G", "'@N1-G"],
    ["+cmd|' /C calc'!A0", "'+cmd|' /C calc'!A0"],
    ["-2+3", "'-2+3"],
    ["\tX", "'\tX"],
    ["\rX", "\"'\rX\""],
    ["-", "'-"],
  ])("text %j → %s", (input, expected) => {
    expect(csvField(input)).toBe(expected);
  });
  it("leaves numbers and numeric text alone, including negative money", () => {
    expect(csvField(-12.5)).toBe("-12.5");
    expect(csvField("-12.50")).toBe("-12.50");
    expect(csvField("+3")).toBe("+3");
    expect(csvField("-1e3")).toBe("-1e3");
    expect(csvField(Number.NEGATIVE_INFINITY)).toBe("");
    expect(neutraliseFormula("A=B")).toBe("A=B");
  });
  it("toCsv applies it to every cell, header included", () => {
    expect(toCsv(["id", "amount"], [{ id: "=1+1", amount: -5 }])).toBe("id,amount\n'=1+1,-5\n");
    expect(toCsv(["a"], [{ a: "x" }], "\r\n")).toBe("a\r\nx\r\n");
  });
});

describe("one CSV writer", () => {
  it("no source file outside src/core/csv.ts quotes CSV cells itself", () => {
    // RFC 4180 quoting is `replace(/"/g, '""')`; a second copy would bypass the formula rule.
    const offenders: string[] = [];
    const walk = (dir: string): void => {
      for (const e of readdirSync(dir, { withFileTypes: true })) {
        const p = join(dir, e.name);
        if (e.isDirectory()) walk(p);
        else if (p.endsWith(".ts") && p !== join("src", "core", "csv.ts") && readFileSync(p, "utf8").includes(`replace(/"/g, '""')`)) offenders.push(p);
      }
    };
    walk("src");
    expect(offenders).toEqual([]);
  });
});
