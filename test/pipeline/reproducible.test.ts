// Issue 16, item 7: the same inputs give byte-identical sites, whatever day they are built on
// (the build is dated by the portfolio's as-of date unless SOURCE_DATE_EPOCH dates it).
import { describe, expect, it } from "vitest";
import { mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import { join, relative } from "node:path";
import { tmpdir } from "node:os";
import { buildPortfolioSite } from "../../src/pipeline/build.ts";
import { buildDateFromEpoch } from "../../src/cli/main.ts";

async function listFiles(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const entry of await readdir(dir, { withFileTypes: true, recursive: true })) {
    if (entry.isFile()) out.push(relative(dir, join(entry.parentPath, entry.name)));
  }
  return out.sort();
}

describe("reproducible builds", () => {
  it("two builds of the same portfolio are identical file for file", async () => {
    const root = await mkdtemp(join(tmpdir(), "ohmbook-repro-"));
    try {
      const a = join(root, "a");
      const b = join(root, "b");
      await buildPortfolioSite({ dir: "test/fixtures/spec-portfolio", outDir: a, strict: false });
      await buildPortfolioSite({ dir: "test/fixtures/spec-portfolio", outDir: b, strict: false });
      const files = await listFiles(a);
      expect(files.length).toBeGreaterThan(10);
      expect(await listFiles(b)).toEqual(files);
      for (const f of files) {
        const [x, y] = await Promise.all([readFile(join(a, f)), readFile(join(b, f))]);
        expect(x.equals(y), f).toBe(true);
      }
      // dated by the data, not the clock
      expect(await readFile(join(a, "index.html"), "utf8")).toContain("Figures as of");
    } finally {
      await rm(root, { recursive: true, force: true });
    }
  }, 120_000);

  it("SOURCE_DATE_EPOCH dates the build (reproducible-builds.org convention)", () => {
    expect(buildDateFromEpoch("1700000000")).toBe("2023-11-14"); // 1,700,000,000 s = 2023-11-14T22:13:20Z
    expect(buildDateFromEpoch(undefined)).toBeUndefined();
    expect(() => buildDateFromEpoch("yesterday")).toThrow(/SOURCE_DATE_EPOCH/);
  });
});
