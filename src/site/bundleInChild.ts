/**
 * The client bundle built by Vite in a child process (bundleChild.ts), so the memory the bundler
 * keeps is given back when it exits, and the bundle can be made while the build is still
 * analysing. Same bundle, same files as building it in this process (test/site/bundleInChild.test.ts).
 */
import { fork, type ChildProcess } from "node:child_process";
import { fileURLToPath } from "node:url";
import type { ClientBundle } from "./clientBundle.ts";
import type { BundleReply, BundleRequest } from "./bundleChild.ts";

/** Vite (or the bundler's process) failed; the message is Vite's, without terminal colours. */
export class BundleChildError extends Error {}

/** Bundler processes still running, so a build stopped by a signal can stop them too. */
const running = new Set<ChildProcess>();

/** Stops every bundler process still running (for a signal handler about to exit). */
export function stopBundleChildren(): void {
  for (const child of running) child.kill();
  running.clear();
}

/** The entry to fork: the compiled bundleChild.js beside this file, or the source through tsx. */
function entry(): string {
  const here = import.meta.url;
  return fileURLToPath(here.endsWith(".ts") ? new URL("./bundleChild.dev.mjs", here) : new URL("./bundleChild.js", here));
}

/**
 * Bundles `contentDir/assets` into `siteDir` (emptied first) in a child process, as
 * buildClientBundle does in this one. `signal` stops the process.
 * @throws BundleChildError when Vite fails or the process dies.
 */
export function buildClientBundleInChild(contentDir: string, siteDir: string, workDir: string, verbose: boolean, signal?: AbortSignal): Promise<ClientBundle> {
  const request: BundleRequest = { contentDir, siteDir, workDir, verbose };
  return new Promise((resolve, reject) => {
    const child = fork(entry(), [JSON.stringify(request)], {
      // Not this process's flags (a test runner's, --inspect…): the entry brings what it needs.
      execArgv: [],
      stdio: verbose ? ["ignore", "inherit", "inherit", "ipc"] : ["ignore", "ignore", "pipe", "ipc"],
      serialization: "json",
      signal,
    });
    running.add(child);
    let stderr = "";
    child.stderr?.setEncoding("utf8").on("data", (chunk: string) => {
      stderr = (stderr + chunk).slice(-4000);
    });
    let reply: BundleReply | null = null;
    child.on("message", (message) => {
      reply = message as BundleReply;
    });
    child.on("error", (error) => {
      running.delete(child);
      reject(new BundleChildError(`the bundler process failed: ${error.message}`));
    });
    child.on("exit", (code, signal) => {
      running.delete(child);
      const r = reply as BundleReply | null;
      if (r?.ok) resolve(r.bundle);
      else if (r) reject(new BundleChildError(r.message));
      else reject(new BundleChildError(`the bundler process stopped (${signal ?? `exit code ${code}`}) before it finished${stderr.trim() ? `: ${stderr.trim().split("\n").slice(-3).join(" ")}` : ""}`));
    });
  });
}
