/**
 * Content hashes for caches: a value hashed by what it holds, and a folder by its files. Kept in
 * core because the analysis cache (pipeline) and the page cache (site) key on the same recipe.
 */
import { createHash, type Hash } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";

/**
 * SHA-256 of a value's content: numbers by their 64-bit pattern, strings, arrays, Map and Set in
 * order, typed arrays byte for byte, objects by sorted keys (functions skipped). Unlike
 * node:v8's serializer, it does not depend on how V8 happens to store a number (small integer
 * or double), which changes as code runs over an object.
 * @example contentHash({ a: 1, b: [2] }) === contentHash({ b: [2], a: 1 }) // true
 */
export function contentHash(value: unknown): string {
  const hash = createHash("sha256");
  const number = Buffer.alloc(8);
  const walk = (v: unknown): void => {
    if (v === null) hash.update("n");
    else if (v === undefined) hash.update("u");
    else if (typeof v === "boolean") hash.update(v ? "T" : "F");
    else if (typeof v === "number") {
      number.writeDoubleLE(Number.isNaN(v) ? Number.NaN : v);
      hash.update("d").update(number);
    } else if (typeof v === "string") hash.update(`s${v.length}:`).update(v);
    else if (typeof v === "bigint") hash.update(`b${v.toString()};`);
    else if (typeof v === "function" || typeof v === "symbol") return;
    else if (ArrayBuffer.isView(v)) hash.update(`a${v.constructor.name}${v.byteLength}:`).update(new Uint8Array(v.buffer, v.byteOffset, v.byteLength));
    else if (Array.isArray(v)) {
      hash.update(`[${v.length}`);
      for (const x of v) walk(x);
      hash.update("]");
    } else if (v instanceof Map) {
      hash.update(`M${v.size}`);
      for (const [k, x] of v) {
        walk(k);
        walk(x);
      }
    } else if (v instanceof Set) {
      hash.update(`S${v.size}`);
      for (const x of v) walk(x);
    } else if (v instanceof Date) hash.update(`D${v.getTime()};`);
    else {
      const keys = Object.keys(v as object).filter((k) => typeof (v as Record<string, unknown>)[k] !== "function").sort();
      hash.update(`{${keys.length}`);
      for (const k of keys) {
        hash.update(`k${k.length}:${k}`);
        walk((v as Record<string, unknown>)[k]);
      }
      hash.update("}");
    }
  };
  walk(value);
  return hash.digest("hex");
}

/** Every file under `dir` whose name matches `include` (relative path and contents), sorted by name, into `hash`. */
export function hashFolder(hash: Hash, dir: string, include: RegExp, prefix = ""): void {
  for (const entry of readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : 1))) {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) hashFolder(hash, path, include, `${prefix}${entry.name}/`);
    else if (include.test(entry.name)) {
      hash.update(`${prefix}${entry.name}\0`);
      hash.update(readFileSync(path));
      hash.update("\0");
    }
  }
}
