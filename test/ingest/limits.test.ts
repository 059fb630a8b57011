/**
 * The id limits of src/ingest/limits.ts must match how pages name their files
 * (src/report/nav.ts `fileSafe`), so an id `check` accepts always fits a file name (255 bytes,
 * the common limit of ext4, APFS and NTFS).
 */
import { describe, expect, it } from "vitest";
import { idLengthProblem, MAX_PAGE_NAME_CHARS, pageNameLength } from "../../src/ingest/limits.ts";
import { fileSafe, meterBillsPath } from "../../src/report/nav.ts";

describe("id limits", () => {
  it.each(["M1", "M:1", "@N1-G", "=HYPERLINK(1)", "Zähler 7", "🙂-meter", "a/b\\c"])("pageNameLength(%j) equals the escaped file name length", (id) => {
    expect(pageNameLength(id)).toBe(fileSafe(id).length);
  });
  it("every accepted id gives a page file name under 255 bytes", () => {
    for (const id of ["M".repeat(100), "@".repeat(66), "🙂".repeat(25), "ä".repeat(50)]) {
      if (idLengthProblem("meter_id", id) !== null) continue;
      const name = meterBillsPath("B", id).split("/").at(-1)!;
      expect(Buffer.byteLength(name), id).toBeLessThan(255);
      expect(pageNameLength(id)).toBeLessThanOrEqual(MAX_PAGE_NAME_CHARS);
    }
    expect(idLengthProblem("meter_id", "@".repeat(67))).toMatch(/page file name of 201 characters/);
    expect(idLengthProblem("meter_id", "M".repeat(101))).toMatch(/101 bytes/);
  });
});
