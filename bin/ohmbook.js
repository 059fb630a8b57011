#!/usr/bin/env node
// Launcher: runs the compiled CLI (dist/cli/main.js, built by `npm run prepare`, which `npm ci`
// runs) when it is at least as new as every file under src/; otherwise the TypeScript source
// through tsx, so an edited checkout never runs stale code. Signals reach the real CLI (so a
// stopped build cleans up and never finishes on its own later), and its exit code is ours.
import { spawn } from "node:child_process";
import { existsSync, readdirSync, statSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { dirname, join } from "node:path";
import { createRequire } from "node:module";
import { childEnv } from "./childEnv.js";

const here = dirname(fileURLToPath(import.meta.url));
const root = join(here, "..");
const compiled = join(root, "dist", "cli", "main.js");

/** Newest modification time (ms) of the files under `dir`. */
function newestMtime(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(path) : statSync(path).mtimeMs);
  }
  return newest;
}

function compiledIsFresh() {
  if (!existsSync(compiled)) return false;
  const src = join(root, "src");
  return !existsSync(src) || statSync(compiled).mtimeMs >= newestMtime(src);
}

let command;
if (compiledIsFresh()) {
  command = [compiled];
} else {
  const require = createRequire(import.meta.url);
  command = [require.resolve("tsx/cli"), join(root, "src", "cli", "main.ts")];
}
const child = spawn(process.execPath, [...command, ...process.argv.slice(2)], { stdio: "inherit", env: childEnv() });
for (const signal of ["SIGINT", "SIGTERM", "SIGHUP"]) {
  process.on(signal, () => {
    if (child.exitCode === null) child.kill(signal);
  });
}
child.on("exit", (code, signal) => {
  process.exit(code ?? (signal === "SIGINT" ? 130 : signal === "SIGTERM" ? 143 : 1));
});
