/**
 * Reproducible pseudo-randomness, the same on every machine: mulberry32 (a public-domain 32-bit
 * seeded generator) for model subsampling, forecast scenarios and test data, and FNV-1a for
 * short stable hashes (per-meter seeds, dispute ids).
 */

/**
 * The raw generator: each call returns the next unsigned 32-bit integer.
 * @example mulberry32Uint32(1)() // the same integer on every run
 */
function mulberry32Uint32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (t ^ (t >>> 14)) >>> 0;
  };
}

/**
 * Uniforms in [0, 1): the raw integer divided by 2³².
 * @example const next = mulberry32(1); next() // a number in [0, 1)
 */
export function mulberry32(seed: number): () => number {
  const next = mulberry32Uint32(seed);
  return () => next() / 4294967296;
}

/**
 * Uniforms strictly inside (0, 1): (integer + ½) / 2³², for transforms that take log(u)
 * (Box–Muller), where u = 0 would be −Infinity.
 */
export function mulberry32Open(seed: number): () => number {
  const next = mulberry32Uint32(seed);
  return () => (next() + 0.5) / 4294967296;
}

/**
 * FNV-1a, 32 bits, of a string's UTF-16 code units; `basis` is xor-ed into the offset basis
 * so one text can seed several independent streams.
 * @example fnv1a32("a") // 0xe40c292c (FNV reference value for "a")
 */
export function fnv1a32(text: string, basis = 0): number {
  let h = (0x811c9dc5 ^ basis) >>> 0;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}
