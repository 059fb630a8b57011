// The client bundle made in a child process (so the bundler's memory is returned when it exits)
// is the bundle Vite makes in this process: same tags, same files, same bytes.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtemp, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { buildClientBundle } from "../../src/site/clientBundle.ts";
import { BundleChildError, buildClientBundleInChild } from "../../src/site/bundleInChild.ts";
import { viteOptions } from "../../src/site/viteOptions.ts";

const CONTENT = resolve(import.meta.dirname, "..", "..", "content");

describe("client bundle in a child process", () => {
  let work: string;
  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-bundle-child-"));
  });
  afterAll(async () => {
    await rm(work, { recursive: true, force: true });
  });

  it("writes the same files and tags as Vite in this process", async () => {
    const here = await buildClientBundle(CONTENT, join(work, "here"), join(work, "w1"), viteOptions(false, () => {}));
    const child = await buildClientBundleInChild(CONTENT, join(work, "child"), join(work, "w2"), false);
    expect(child).toEqual(here);
    for (const f of here.files) expect((await readFile(join(work, "child", f))).equals(await readFile(join(work, "here", f))), f).toBe(true);
  }, 120_000);

  it("reports Vite's error, and a stopped process, as BundleChildError", async () => {
    const abort = new AbortController();
    const stopped = buildClientBundleInChild(CONTENT, join(work, "stopped"), join(work, "w3"), false, abort.signal);
    abort.abort();
    await expect(stopped).rejects.toBeInstanceOf(BundleChildError);
    await expect(buildClientBundleInChild(join(work, "no-such-content"), join(work, "bad"), join(work, "w4"), false)).rejects.toThrow(/ENOENT|no such file/);
  }, 120_000);
});
