import { describe, expect, it } from "vitest";
import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import { oneShot } from "../../src/core/oneShot.ts";

// A garbage collection on demand (node's documented --expose-gc, turned on at run time).
setFlagsFromString("--expose-gc");
const gc = runInNewContext("gc") as () => void;

describe("oneShot", () => {
  it("yields the source's items once, then refuses a second iteration instead of yielding nothing", () => {
    const once = oneShot(new Set(["a", "b"]));
    expect([...once]).toEqual(["a", "b"]);
    expect(() => [...once]).toThrow(/already iterated/);
  });

  it("lets go of its source once iteration starts (the source can be collected while the wrapper lives)", async () => {
    let ref: WeakRef<object>;
    const once = (() => {
      const big = [1, 2, 3];
      ref = new WeakRef(big);
      return oneShot(big);
    })();
    expect([...once]).toEqual([1, 2, 3]);
    await new Promise((r) => setTimeout(r, 0));
    gc();
    expect(ref!.deref()).toBeUndefined();
    // Control: a plain wrapper that keeps its source keeps it alive, so the check above can fail.
    let kept: WeakRef<object>;
    const plain = (() => {
      const big = [1, 2, 3];
      kept = new WeakRef(big);
      return { [Symbol.iterator]: () => big[Symbol.iterator]() };
    })();
    expect([...plain]).toEqual([1, 2, 3]);
    await new Promise((r) => setTimeout(r, 0));
    gc();
    expect(kept!.deref()).toBeDefined();
  });
});
