/**
 * Seeded pseudo-random numbers for the forecast scenarios, so a build is reproducible:
 * mulberry32 (a 32-bit generator, public domain) for uniforms, Box–Muller for standard
 * normals, and a chi-square variate as a sum of squared normals (exact, fine for the
 * small degrees of freedom of a monthly model).
 */

import { mulberry32Uint32 } from "../core/random.ts";

/** A generator of uniforms in (0, 1). */
export type Uniform = () => number;

/**
 * mulberry32 seeded with a 32-bit integer.
 * @example const u = mulberry32(42); u(); // same first value on every run
 */
export function mulberry32(seed: number): Uniform {
  const next = mulberry32Uint32(seed);
  // Shift into (0, 1): Box–Muller takes log(u) and u = 0 would be -Infinity.
  return () => (next() + 0.5) / 4294967296;
}

/** A 32-bit seed from a string (FNV-1a), so each meter gets its own stream. */
export function seedFromString(text: string, base = 0): number {
  let h = (0x811c9dc5 ^ base) >>> 0;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

/** Standard normal by Box–Muller (one of the pair; simplicity over speed). */
export function standardNormal(u: Uniform): number {
  return Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
}

/**
 * The factor sqrt(df / V) with V ~ χ²(df): multiplying a standard normal by it gives a
 * Student-t variate with `df` degrees of freedom. Returns 1 for df = Infinity or above 1000
 * (the t is then indistinguishable from the normal).
 */
export function studentScale(u: Uniform, df: number): number {
  if (!(df >= 1)) return 1;
  if (df > 1000) return 1;
  let v = 0;
  for (let i = 0; i < df; i++) {
    const z = standardNormal(u);
    v += z * z;
  }
  return Math.sqrt(df / v);
}
