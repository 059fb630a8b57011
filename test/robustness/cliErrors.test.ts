/**
 * The CLI never prints a stack trace for a user mistake or an environment problem (issue 16,
 * "Done when"): each case exits 1 with a message naming the path and the cause.
 */
import { cp, mkdir, mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli, type CliIo } from "../../src/cli/main.ts";

let root = "";
beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), "ohmbook-cli-errors-"));
});
afterAll(async () => {
  await rm(root, { recursive: true, force: true });
});

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const io: CliIo = { out: (s) => void (out += s), err: (s) => void (err += s), isTty: false };
  const code = await runCli(args, io);
  return { code, out, err };
}
const noTrace = (text: string): void => {
  expect(text).not.toMatch(/internal error/);
  expect(text).not.toMatch(/\n\s+at .*:\d+:\d+/);
};

describe("user and environment errors are messages, not stack traces", () => {
  it("init into a path that is a file", async () => {
    const file = join(root, "a-file");
    await writeFile(file, "x");
    const r = await run(["init", file]);
    expect(r.code).toBe(1);
    expect(r.err).toContain("is a file, not a folder");
    noTrace(r.err);
  });

  it("check of a folder that does not exist", async () => {
    const r = await run(["check", join(root, "nowhere")]);
    expect(r.code).toBe(1);
    expect(`${r.out}${r.err}`).toMatch(/cannot open the portfolio folder: it does not exist/);
    noTrace(`${r.out}${r.err}`);
  });

  it("check and build with a folder where bills.csv belongs: file:0:0 with the folder prefix", async () => {
    const dir = join(root, "p");
    await cp("test/fixtures/ingest/good", dir, { recursive: true });
    await rm(join(dir, "bills.csv"));
    await mkdir(join(dir, "bills.csv"));
    const c = await run(["check", dir]);
    expect(c.code).toBe(1);
    expect(c.out).toContain(`${dir}/bills.csv:0:0: error: this is a folder, not a file`);
    const b = await run(["build", dir, "--out", join(root, "site")]);
    expect(b.code).toBe(1);
    expect(b.err).toContain(`${dir}/bills.csv:0:0: error: this is a folder, not a file`);
    noTrace(b.err);
  }, 60_000);
});
