/**
 * A cheaper `Frame.set` for Nunjucks 3.2.4, the same in every effect.
 *
 * Nunjucks writes every loop variable through `Frame.set` (`loop.index`, `loop.first`… eight
 * writes per iteration of every `for`), and `set` splits the name on dots each time to build
 * nested variables. A site's data tables run a few hundred thousand iterations, so the split
 * arrays were a measurable part of rendering. Here the split of each name is kept (names come
 * from template code: a few hundred in all), and the rest of `set` is unchanged.
 *
 * The library's own function is replaced only when its code is exactly the one this was written
 * from (SHA-256 of its source); any other version of Nunjucks keeps its own.
 */
import { createHash } from "node:crypto";

/** SHA-256 of the source of Nunjucks 3.2.4's `Frame.prototype.set` (node_modules/nunjucks/src/runtime.js). */
const KNOWN_SET = "90d04f86f75cb63023cf96a3881dbb1a33501fdadf493f0ed3e210ad147591e7";

/** The part of a Nunjucks frame `set` reads and writes. */
interface Frame {
  variables: Record<string, unknown>;
  resolve(name: string, forWrite: boolean): Frame | undefined;
  set(name: string, val: unknown, resolveUp?: boolean): void;
}

/** Splits of names on dots, by name. Bounded, in case a template writes names made at run time. */
const parts = new Map<string, string[]>();
const MAX_NAMES = 10_000;

function partsOf(name: string): string[] {
  let p = parts.get(name);
  if (p === undefined) {
    p = name.split(".");
    if (parts.size >= MAX_NAMES) parts.clear();
    parts.set(name, p);
  }
  return p;
}

/** Nunjucks' Frame.set with the split of `name` kept (the arrays are only read). */
function set(this: Frame, name: string, val: unknown, resolveUp?: boolean): void {
  const path = partsOf(name);
  let obj = this.variables;
  if (resolveUp) {
    const frame = this.resolve(path[0], true);
    if (frame) {
      frame.set(name, val);
      return;
    }
  }
  for (let i = 0; i < path.length - 1; i++) {
    const id = path[i];
    if (!obj[id]) obj[id] = {};
    obj = obj[id] as Record<string, unknown>;
  }
  obj[path[path.length - 1]] = val;
}

/**
 * Replaces `runtime.Frame.prototype.set` (Nunjucks' runtime module) with the cheaper one when it
 * is Nunjucks 3.2.4's; returns whether it is now the cheaper one.
 * @example speedUpFrameSet(nunjucks.runtime) // true
 */
export function speedUpFrameSet(runtime: { Frame?: { prototype: { set: unknown } } }): boolean {
  const proto = runtime.Frame?.prototype;
  if (proto === undefined || typeof proto.set !== "function") return false;
  if (proto.set === set) return true;
  if (createHash("sha256").update(String(proto.set)).digest("hex") !== KNOWN_SET) return false;
  proto.set = set;
  return true;
}
