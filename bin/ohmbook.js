#!/usr/bin/env node
// Thin launcher: runs the TypeScript CLI through tsx so no compile step is needed.
import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import { dirname, join } from "node:path";
import { createRequire } from "node:module";

const here = dirname(fileURLToPath(import.meta.url));
const require = createRequire(import.meta.url);
const tsxCli = require.resolve("tsx/cli");
const main = join(here, "..", "src", "cli", "main.ts");
const result = spawnSync(process.execPath, [tsxCli, main, ...process.argv.slice(2)], { stdio: "inherit" });
process.exit(result.status ?? 1);
