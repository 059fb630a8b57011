import { describe, expect, it } from "vitest";
import fc from "fast-check";
import nunjucks from "nunjucks";
import { speedUpFrameSet } from "../../src/site/nunjucksFrameSet.ts";
import { formerSet } from "./former/frameSet.ts";

type Frame = InstanceType<typeof nunjucks.runtime.Frame>;
const { Frame } = nunjucks.runtime;

/** A chain of frames (root first), made with `set` as the frames' set, after `writes`; returns their variables and the writes' errors. */
function run(set: Frame["set"], isolate: boolean[], writes: [depth: number, name: string, value: number, resolveUp: boolean][]): unknown {
  const saved = Frame.prototype.set;
  Frame.prototype.set = set;
  try {
    const frames: Frame[] = [];
    for (let i = 0; i < isolate.length; i++) frames.push(new Frame(frames[i - 1], isolate[i]));
    const failed: string[] = [];
    for (const [depth, name, value, resolveUp] of writes) {
      try {
        frames[Math.min(depth, frames.length - 1)].set(name, value, resolveUp);
      } catch (error) {
        // Both run in strict mode: a dotted name through a number throws the same TypeError.
        failed.push((error as Error).message);
      }
    }
    return { failed, variables: frames.map((f) => JSON.parse(JSON.stringify(f.variables)) as unknown) };
  } finally {
    Frame.prototype.set = saved;
  }
}

describe("speedUpFrameSet (nunjucksFrameSet.ts)", () => {
  it("recognises Nunjucks' own Frame.set and replaces it, once", () => {
    expect(speedUpFrameSet(nunjucks.runtime)).toBe(true);
    const patched = Frame.prototype.set;
    expect(speedUpFrameSet(nunjucks.runtime)).toBe(true);
    expect(Frame.prototype.set).toBe(patched);
  });

  it("leaves another version's Frame.set alone", () => {
    const other = { Frame: { prototype: { set(this: unknown, name: string) { return name; } } } };
    const before = other.Frame.prototype.set;
    expect(speedUpFrameSet(other)).toBe(false);
    expect(other.Frame.prototype.set).toBe(before);
  });

  // Tolerance: none. Every write (plain and dotted names, writes that resolve up the chain,
  // isolated frames, and writes that fail) must leave every frame's variables exactly as Nunjucks' own set does.
  it("leaves every frame as Nunjucks' own set does, for any sequence of writes", () => {
    speedUpFrameSet(nunjucks.runtime);
    const patched = Frame.prototype.set;
    expect(patched).not.toBe(formerSet);
    const name = fc.constantFrom("x", "y", "loop.index", "loop.first", "loop", "a.b.c", "a.b", "a", "cls", "x.y");
    const write = fc.tuple(fc.nat(3), name, fc.integer({ min: -2, max: 2 }), fc.boolean());
    fc.assert(
      fc.property(fc.array(fc.boolean(), { minLength: 1, maxLength: 4 }), fc.array(write, { maxLength: 20 }), (isolate, writes) => {
        expect(run(patched, isolate, writes)).toEqual(run(formerSet as Frame["set"], isolate, writes));
      }),
      { numRuns: 500 },
    );
  });
});
