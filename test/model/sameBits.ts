/**
 * Deep equality for the "same as before" tests: every number compared with Object.is (−0 and NaN
 * count as themselves), typed arrays, arrays, Maps (in order) and plain objects (by their keys)
 * walked; functions (a result's methods) are not compared.
 * @example sameBits({ a: [0] }, { a: [-0] }) // false
 */
export function sameBits(a: unknown, b: unknown): boolean {
  if (typeof a === "number" && typeof b === "number") return Object.is(a, b);
  if (typeof a === "function" || typeof b === "function") return true;
  if (a instanceof Map && b instanceof Map) return sameBits([...a], [...b]);
  if (ArrayBuffer.isView(a) && ArrayBuffer.isView(b)) return sameBits(Array.from(a as unknown as ArrayLike<number>), Array.from(b as unknown as ArrayLike<number>));
  if (Array.isArray(a) && Array.isArray(b)) return a.length === b.length && a.every((v, i) => sameBits(v, b[i]));
  if (a && b && typeof a === "object" && typeof b === "object") {
    const ka = Object.keys(a).sort();
    const kb = Object.keys(b).sort();
    return sameBits(ka, kb) && ka.every((k) => sameBits((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
  }
  return Object.is(a, b);
}
