/**
 * A full garbage collection on demand, for the points where a build drops a lot at once (the end
 * of a stage, between passes of pages). V8 sizes its next collection from what is live after the
 * last one, so garbage carried into a stage raises that stage's peak memory; collecting at the
 * boundary keeps the peak near what is really live. node:v8 can expose `gc` at run time; a no-op
 * where it cannot.
 */
import { setFlagsFromString } from "node:v8";
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
