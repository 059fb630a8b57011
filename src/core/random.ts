/**
 * mulberry32, a public-domain 32-bit seeded generator: reproducible random numbers for model
 * subsampling, forecast scenarios and test data, the same on every machine.
 */

/**
 * The raw generator: each call returns the next unsigned 32-bit integer.
 * @example mulberry32Uint32(1)() // the same integer on every run
 */
export function mulberry32Uint32(seed: number): () => number {
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
