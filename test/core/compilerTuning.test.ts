import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { INTERRUPT_BUDGET, tuneCompilerForBuilds } from "../../src/core/compilerTuning.ts";

describe("compiler tuning for builds (src/core/compilerTuning.ts)", () => {
  it("is four times the interrupt budget this Node's V8 starts with", () => {
    // Source: the running Node's own option list (`node --v8-options`), not a remembered value.
    const options = spawnSync(process.execPath, ["--v8-options"], { encoding: "utf8" }).stdout;
    const fallback = /--interrupt-budget=(\d+)/.exec(options.slice(options.indexOf("--interrupt-budget ")));
    expect(fallback).not.toBeNull();
    expect(INTERRUPT_BUDGET).toBe(4 * Number(fallback![1]));
  });

  it("is accepted by V8 at run time and can be applied twice", () => {
    const script = `import("node:v8").then((v8) => { v8.setFlagsFromString("--interrupt-budget=${INTERRUPT_BUDGET}"); console.log("ok"); })`;
    const run = spawnSync(process.execPath, ["-e", script], { encoding: "utf8" });
    expect(run.stderr).toBe("");
    expect(run.stdout.trim()).toBe("ok");
    expect(() => {
      tuneCompilerForBuilds();
      tuneCompilerForBuilds();
    }).not.toThrow();
  });
});
