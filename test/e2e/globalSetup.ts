/**
 * Builds the demo site once for the whole browser suite (the demo, dispute and layout tests all
 * read the same build, dated 2026-01-15 so it is reproducible) and hands its folder to the test
 * files through vitest's `provide` / `inject`. The tests only read it.
 */
import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { TestProject } from "vitest/node";
import { buildPortfolioSite } from "../../src/pipeline/build.ts";

declare module "vitest" {
  export interface ProvidedContext {
    /** Folder of the demo site built for the browser suite. */
    demoSite: string;
  }
}

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  const work = await mkdtemp(join(tmpdir(), "ohmbook-e2e-demo-"));
  const site = join(work, "site");
  await buildPortfolioSite({ dir: "data/demo", outDir: site, strict: false, buildDate: "2026-01-15" });
  project.provide("demoSite", site);
  return async () => {
    await rm(work, { recursive: true, force: true });
  };
}
