/**
 * How eagerly V8 hands a function to its optimizing compiler, set for a whole build.
 *
 * V8 optimizes a function once it has run a budget of bytecode (`--interrupt-budget`, 66 KiB in
 * Node 20). A build runs thousands of middling functions — a page's view model, a meter's
 * screening pass — a few times each per building, and at the default budget many of them are
 * optimized, which takes the compiler's threads a quarter of the build's CPU, and then run only a
 * little longer. Four times the budget leaves those to the baseline tiers and still optimizes the
 * loops that matter (long loops tier up on the stack). Measured with `bench:scale` at 128
 * buildings on 2 cores, in alternating runs: 8 % less CPU at 4×, no further gain at 8×, the same
 * output byte for byte. It changes only when code is compiled, never what it computes.
 *
 * Set at run time so every way into the pipeline (the CLI, a shard, the benchmark) gets it; a
 * flag V8 does not know is ignored after a line on stderr (the test checks this one is known). V8 reads the budget each time it resets a function's
 * counter, so setting it before the build's work starts is enough; worker threads share it.
 */
import { setFlagsFromString } from "node:v8";

/** Four times Node 20's default (`node --v8-options`: `--interrupt-budget=67584`). */
export const INTERRUPT_BUDGET = 4 * 67584;

let applied = false;

export function tuneCompilerForBuilds(): void {
  if (applied) return;
  applied = true;
  setFlagsFromString(`--interrupt-budget=${INTERRUPT_BUDGET}`);
}
