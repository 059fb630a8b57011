/**
 * Regenerates the demo portfolio folder: `npx tsx scripts/generate-demo.ts [OUT_DIR]`
 * (default data/demo). The folder is replaced wholesale; every file in it is generated.
 */
import { mkdirSync, rmSync, writeFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { generateDemo } from "./demo/generate.ts";

/** Writes the generated files under `outDir`, replacing what was there. */
export function writeDemo(outDir: string): number {
  const { files } = generateDemo();
  rmSync(outDir, { recursive: true, force: true });
  let bytes = 0;
  for (const [rel, text] of files) {
    const path = join(outDir, rel);
    mkdirSync(dirname(path), { recursive: true });
    writeFileSync(path, text, "utf8");
    bytes += Buffer.byteLength(text);
  }
  return bytes;
}

const isMain = process.argv[1] !== undefined && resolve(process.argv[1]) === resolve(import.meta.filename);
if (isMain) {
  const outDir = resolve(process.argv[2] ?? "data/demo");
  const started = performance.now();
  const bytes = writeDemo(outDir);
  process.stdout.write(`demo written to ${outDir}: ${(bytes / 1e6).toFixed(2)} MB in ${((performance.now() - started) / 1000).toFixed(1)} s\n`);
}
