#!/usr/bin/env node
// Thin launcher: runs the TypeScript CLI through tsx so no compile step is needed.
// Signals reach the real CLI (so a stopped build cleans up and never finishes on its own later),
// and its exit code is ours.
import { spawn } from "node:child_process";
import { fileURLToPath } from "node:url";
import { dirname, join } from "node:path";
import { createRequire } from "node:module";

const here = dirname(fileURLToPath(import.meta.url));
const require = createRequire(import.meta.url);
const tsxCli = require.resolve("tsx/cli");
const main = join(here, "..", "src", "cli", "main.ts");
const child = spawn(process.execPath, [tsxCli, main, ...process.argv.slice(2)], { stdio: "inherit" });
for (const signal of ["SIGINT", "SIGTERM", "SIGHUP"]) {
  process.on(signal, () => {
    if (child.exitCode === null) child.kill(signal);
  });
}
child.on("exit", (code, signal) => {
  process.exit(code ?? (signal === "SIGINT" ? 130 : signal === "SIGTERM" ? 143 : 1));
});
