/**
 * A full garbage collection on demand, for the points where a build drops a lot at once (the end
 * of a stage, between passes of pages). V8 sizes its next collection from what is live after the
 * last one, so garbage carried into a stage raises that stage's peak memory; collecting at the
 * boundary keeps the peak near what is really live. node:v8 can expose `gc` at run time; a no-op
 * where it cannot.
 */
import { getHeapStatistics, setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";

const gc: (() => void) | null = (() => {
  try {
    setFlagsFromString("--expose-gc");
    return runInNewContext("gc") as () => void;
  } catch {
    return null;
  }
})();

export function collectGarbage(): void {
  gc?.();
}

/**
 * Garbage a loop may pile up between collections: small beside the memory target (1.5 GB), and
 * a collection costs a fraction of a second even at 1,000 buildings, so a few dozen cost little.
 */
export const GARBAGE_BUDGET_BYTES = 128 * 2 ** 20;

/**
 * For a loop that makes a lot of short-lived garbage while little stays live (writing thousands of
 * files): V8 lets such garbage pile up to a multiple of the heap that was live at its last full
 * collection, which at a thousand buildings is a gigabyte. Call `check()` after each item; it
 * collects once the heap has grown by `budgetBytes` since the last collection. Cheap when it does
 * not collect (one read of the heap's size, ~2 µs).
 */
export function garbageBudget(budgetBytes = GARBAGE_BUDGET_BYTES): { check(): void } {
  let floor = heapUsed();
  return {
    check() {
      if (gc === null) return;
      const used = heapUsed();
      if (used - floor < budgetBytes) return;
      gc();
      floor = heapUsed();
    },
  };
}

/** Bytes in use in V8's heap (process.memoryUsage's heapUsed, without its read of the resident set: ~7× cheaper). */
function heapUsed(): number {
  return getHeapStatistics().used_heap_size;
}
