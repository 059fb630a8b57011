import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdir, mkdtemp, readdir, rm, stat, utimes } from "node:fs/promises";
import { tmpdir } from "node:os";
import { basename, join } from "node:path";
import { makeScratchFolder, refreshActiveScratch, removeScratchFolder } from "../../src/site/writeSite.ts";

// A build of thousands of buildings runs for hours; a second build started next to the same
// output must not take its scratch folder (priced bills, interval readings) for a killed build's.
describe("scratch folders of a long build", () => {
  let work: string;
  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-scratch-"));
  });
  afterAll(async () => {
    await rm(work, { recursive: true, force: true });
  });

  it("are kept fresh while in use, so a later build next to the same output leaves them alone", async () => {
    const out = join(work, "site");
    const first = await makeScratchFolder(out);
    const threeHoursAgo = new Date(Date.now() - 3 * 3600_000);
    await utimes(first, threeHoursAgo, threeHoursAgo);
    await refreshActiveScratch();
    expect(Date.now() - (await stat(first)).mtimeMs).toBeLessThan(60_000);
    const second = await makeScratchFolder(out);
    expect((await readdir(work)).sort()).toEqual([basename(first), basename(second)].sort());
    await removeScratchFolder(second);
    await removeScratchFolder(first);
    expect(await readdir(work)).toEqual([]);
  });

  it("are removed by a later build once their build is gone and they are an hour old", async () => {
    const out = join(work, "site");
    // what a killed build leaves: a scratch folder no process refreshes
    const killed = join(work, ".site.ohmbook-build-killed");
    await mkdir(killed);
    const twoHoursAgo = new Date(Date.now() - 2 * 3600_000);
    await utimes(killed, twoHoursAgo, twoHoursAgo);
    await refreshActiveScratch(); // not this process's: untouched
    expect((await stat(killed)).mtimeMs).toBeLessThan(Date.now() - 3600_000);
    const next = await makeScratchFolder(out);
    expect(await readdir(work)).toEqual([basename(next)]);
    await removeScratchFolder(next);
  });
});
