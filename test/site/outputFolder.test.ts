// Issue 16, item 7: output refusals before any analysis, and a swap cut in half is repaired.
import { describe, expect, it } from "vitest";
import { mkdir, mkdtemp, readFile, rm, stat, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { checkOutputFolder, removeActiveScratch, SITE_MARKER } from "../../src/site/writeSite.ts";
import { buildPortfolioSite } from "../../src/pipeline/build.ts";

describe("output folder", () => {
  it("a build killed between the two renames of the swap: the previous site is put back", async () => {
    const work = await mkdtemp(join(tmpdir(), "ohmbook-swap-"));
    try {
      const out = join(work, "site");
      // what the swap leaves when killed after `out → scratch/previous` and before `stage → out`
      const previous = join(work, ".site.ohmbook-build-abc123", "previous");
      await mkdir(previous, { recursive: true });
      await writeFile(join(previous, SITE_MARKER), "x");
      await writeFile(join(previous, "index.html"), "the old site");
      await checkOutputFolder(out);
      expect(await readFile(join(out, "index.html"), "utf8")).toBe("the old site");
      await expect(stat(previous)).rejects.toThrow();
    } finally {
      await rm(work, { recursive: true, force: true });
    }
  });

  it("refuses the portfolio folder (or a folder inside it) as output before reading anything", async () => {
    const stages: string[] = [];
    const reporter = { stage: (s: string) => { stages.push(s); }, step: () => undefined, warn: () => undefined, finish: () => undefined };
    await expect(buildPortfolioSite({ dir: "data/demo", outDir: "data/demo/site", strict: false, reporter })).rejects.toThrow(/portfolio folder/);
    await expect(buildPortfolioSite({ dir: "data/demo", outDir: "data/demo", strict: false, reporter })).rejects.toThrow(/portfolio folder/);
    // no stage started: nothing was read or analysed
    expect(stages).toEqual([]);
  });

  it("removeActiveScratch is safe to call with nothing in progress", () => {
    expect(() => removeActiveScratch()).not.toThrow();
  });
});
