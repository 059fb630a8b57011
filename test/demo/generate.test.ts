/**
 * The demo folder is generated, never hand-edited: generation is deterministic and the
 * committed data/demo equals a fresh generation byte for byte.
 */
import { mkdtempSync, readFileSync, readdirSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { writeDemo } from "../../scripts/generate-demo.ts";

const COMMITTED = join(import.meta.dirname, "../../data/demo");

function listFiles(root: string): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const p = join(dir, name);
      if (statSync(p).isDirectory()) walk(p);
      else out.push(relative(root, p).split("\\").join("/"));
    }
  };
  walk(root);
  return out.sort();
}

describe("demo generation", () => {
  let dirA = "";
  let dirB = "";
  beforeAll(() => {
    dirA = mkdtempSync(join(tmpdir(), "ohmbook-demo-a-"));
    dirB = mkdtempSync(join(tmpdir(), "ohmbook-demo-b-"));
    writeDemo(dirA);
    writeDemo(dirB);
  }, 120_000);
  afterAll(() => {
    rmSync(dirA, { recursive: true, force: true });
    rmSync(dirB, { recursive: true, force: true });
  });

  it("writes identical bytes on two runs", () => {
    const files = listFiles(dirA);
    expect(listFiles(dirB)).toEqual(files);
    for (const f of files) expect(readFileSync(join(dirB, f)).equals(readFileSync(join(dirA, f))), f).toBe(true);
  });

  it("matches the committed data/demo exactly (regenerate with `npx tsx scripts/generate-demo.ts`)", () => {
    const files = listFiles(dirA);
    expect(listFiles(COMMITTED)).toEqual(files);
    for (const f of files) expect(readFileSync(join(COMMITTED, f)).equals(readFileSync(join(dirA, f))), f).toBe(true);
  });

  it("keeps the folder under 8 MB and holds every file the input contract names", () => {
    const files = listFiles(dirA);
    const bytes = files.reduce((s, f) => s + statSync(join(dirA, f)).size, 0);
    expect(bytes).toBeLessThan(8_000_000);
    for (const f of ["portfolio.yaml", "buildings.csv", "meters.csv", "bills.csv", "bill_lines.csv", "README.md"]) expect(files).toContain(f);
    expect(files.filter((f) => f.startsWith("intervals/")).length).toBe(4);
    expect(files.filter((f) => /^weather\/[^/]+\.csv$/.test(f)).length).toBe(2);
    expect(files).toContain("weather/normals/WX-PRAIRIE.csv");
    expect(files.filter((f) => f.startsWith("tariffs/")).length).toBeGreaterThanOrEqual(3);
  });
});
