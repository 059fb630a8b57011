/**
 * Grouping of repeated problems (issue 16, item 6): the first DETAILS_PER_REASON of a kind are
 * listed, then one summary line names the count and the first line not listed; every rejected
 * row is still counted. "Kind" ignores quoted values and numbers (common practice: log
 * deduplication by message template).
 */
import { describe, expect, it } from "vitest";
import { DETAILS_PER_FILE, DETAILS_PER_REASON, FileContext, reasonKey } from "../../src/ingest/fileContext.ts";
import { MAX_MESSAGE_CHARS } from "../../src/core/issues.ts";

describe("FileContext", () => {
  it("groups one kind after DETAILS_PER_REASON and counts every row", () => {
    const ctx = new FileContext("bills.csv");
    for (let line = 2; line < 2 + 1225; line++) ctx.reject(line, 1, `meter_id "M${line}" is not in meters.csv`, "add it");
    ctx.reject(5000, 4, "usage \"x\" is not a number", "digits");
    ctx.finish();
    expect(ctx.report.rowsRejected).toBe(1226);
    expect(ctx.issues).toHaveLength(DETAILS_PER_REASON + 2);
    const summary = ctx.issues.at(-1)!;
    expect(summary).toMatchObject({ line: 2 + DETAILS_PER_REASON, column: 1, severity: "error" });
    expect(summary.message).toMatch(/^1,205 more rows with the same problem from line 22 on, the first: meter_id "M22" is not in meters.csv$/);
    expect(ctx.report.rejections).toHaveLength(DETAILS_PER_REASON + 2);
  });
  it("lists at most DETAILS_PER_FILE one by one across kinds", () => {
    const ctx = new FileContext("f.csv");
    for (let k = 0; k < 50; k++) for (let i = 0; i < 10; i++) ctx.warn(k * 10 + i + 2, 0, `kind${"x".repeat(k)} problem`);
    ctx.finish();
    const detailed = ctx.issues.filter((i) => !/more lines with the same problem/.test(i.message));
    expect(detailed).toHaveLength(DETAILS_PER_FILE);
  });
  it("caps message length", () => {
    const ctx = new FileContext("f.csv");
    ctx.reject(2, 1, "y".repeat(100_000));
    expect(ctx.issues[0].message.length).toBeLessThanOrEqual(MAX_MESSAGE_CHARS + 40);
  });
  it("reasonKey blanks quoted values and numbers only", () => {
    expect(reasonKey('meter_id "A-1" repeats line 12')).toBe(reasonKey('meter_id "B" repeats line 7'));
    expect(reasonKey("usage is empty")).not.toBe(reasonKey("total is empty"));
  });
});
