/**
 * The layering DEVELOPERS.md describes, checked on every import in src/:
 *  - imports only run down the layers (a folder never imports one above it or beside it);
 *  - another folder is reached only through its index.ts (core's modules and domain/types.ts are
 *    each their own public face; core/time only through core/time/index.ts);
 *  - luxon and Intl date formatting appear only in src/core/time.
 * A failure names the file and the import, so the fix is to move code, not to loosen the test.
 */
import { readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, normalize, relative, sep } from "node:path";
import { describe, expect, it } from "vitest";

const SRC = join(import.meta.dirname, "..", "..", "src");

/** Lower numbers are lower layers; a folder may import folders of strictly lower layers. */
export const LAYERS: Record<string, number> = {
  core: 0, domain: 0,
  tariff: 1, clean: 1, // pricing engine and meter-data screening: pure libraries over domain types
  ingest: 2, // reads the folder (uses tariff's and clean's parsers for their settings)
  audit: 3, model: 3,
  disputes: 4,
  forecast: 5,
  report: 6,
  site: 7,
  pipeline: 8, // sequences the stages
  import: 9,
  cli: 10,
};

function sourceFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) return sourceFiles(p);
    return /\.(ts|mjs|js)$/.test(name) ? [p] : [];
  });
}

const IMPORT = /(?:^|\n)\s*(?:import|export)\b[^;]*?\bfrom\s*"(\.{1,2}\/[^"]+)"|import\(\s*"(\.{1,2}\/[^"]+)"\s*\)/g;

interface Edge { file: string; target: string; from: string; to: string }

function edges(): Edge[] {
  const out: Edge[] = [];
  for (const file of sourceFiles(SRC)) {
    const text = readFileSync(file, "utf8");
    for (const m of text.matchAll(IMPORT)) {
      const spec = m[1] ?? m[2]!;
      const target = normalize(join(dirname(file), spec));
      const from = relative(SRC, file).split(sep)[0]!;
      const to = relative(SRC, target).split(sep)[0]!;
      out.push({ file: relative(SRC, file), target: relative(SRC, target), from, to });
    }
  }
  return out;
}

function isPublicFace(target: string): boolean {
  const parts = target.split(sep);
  const folder = parts[0]!;
  if (folder === "domain") return true;
  if (folder === "core") return parts.length === 2 || (parts.length === 3 && parts[2] === "index.ts");
  return parts.length === 2 && parts[1] === "index.ts";
}

describe("architecture", () => {
  const all = edges();

  it("finds the imports it checks", () => {
    expect(all.length).toBeGreaterThan(300);
    expect(Object.keys(LAYERS).sort()).toEqual(readdirSync(SRC).filter((d) => statSync(join(SRC, d)).isDirectory()).sort());
  });

  it("every import between folders runs down the layers", () => {
    const against = all.filter((e) => e.from !== e.to && !(LAYERS[e.to]! < LAYERS[e.from]!))
      .map((e) => `${e.file} imports ${e.target} (${e.from} is layer ${LAYERS[e.from]}, ${e.to} is layer ${LAYERS[e.to]})`);
    expect(against).toEqual([]);
  });

  it("other folders are reached only through their public face", () => {
    const inner = all.filter((e) => {
      if (e.from === e.to) return e.from === "core" && e.target.startsWith(`core${sep}time${sep}`) && !e.file.startsWith(`core${sep}time${sep}`) && !isPublicFace(e.target);
      return !isPublicFace(e.target);
    }).map((e) => `${e.file} imports ${e.target}: import it from ${e.to}/index.ts`);
    expect(inner).toEqual([]);
  });

  it("every audit check has its own test file", () => {
    const checks = readdirSync(join(SRC, "audit", "checks"))
      .filter((f) => /export function check[A-Z]/.test(readFileSync(join(SRC, "audit", "checks", f), "utf8")))
      .map((f) => f.replace(/\.ts$/, ""));
    expect(checks.length).toBeGreaterThanOrEqual(13);
    const tests = new Set(readdirSync(join(SRC, "..", "test", "audit", "checks")));
    expect(checks.filter((c) => !tests.has(`${c}.test.ts`))).toEqual([]);
  });

  it("luxon and Intl dates are used only in src/core/time", () => {
    const offenders = sourceFiles(SRC)
      .filter((f) => !relative(SRC, f).startsWith(`core${sep}time${sep}`))
      .filter((f) => /from\s*"luxon"|Intl\.DateTimeFormat|toLocaleDateString|toLocaleTimeString/.test(readFileSync(f, "utf8")))
      .map((f) => relative(SRC, f));
    expect(offenders).toEqual([]);
  });
});
