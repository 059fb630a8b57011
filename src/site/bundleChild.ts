/**
 * Child-process entry (bundleInChild.ts): builds the client bundle with Vite and sends it to the
 * parent over IPC. Vite and Rollup keep a few hundred MB resident after a build that a process
 * does not give back (measured: +0.26 GB in a 1,000-building build); in a child of its own that
 * memory is returned when the child exits, and the bundle is made while the parent analyses.
 */
import { buildClientBundle } from "./clientBundle.ts";
import { viteOptions } from "./viteOptions.ts";

export interface BundleRequest {
  contentDir: string;
  siteDir: string;
  workDir: string;
  verbose: boolean;
}

export type BundleReply = { ok: true; bundle: Awaited<ReturnType<typeof buildClientBundle>> } | { ok: false; message: string };

const request = JSON.parse(process.argv[2] ?? "{}") as BundleRequest;
let viteError: Error | null = null;
let reply: BundleReply;
try {
  const options = viteOptions(request.verbose, (error) => {
    viteError ??= error;
  });
  reply = { ok: true, bundle: await buildClientBundle(request.contentDir, request.siteDir, request.workDir, options) };
} catch (error) {
  // Vite's own error names the cause better than what Rollup throws after it.
  const cause = (viteError ?? error) as Error;
  reply = { ok: false, message: cause?.message ?? String(cause) };
}
process.send?.(reply, () => process.exit(0));
