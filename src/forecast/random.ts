/**
 * Seeded pseudo-random numbers for the forecast scenarios, so a build is reproducible:
 * mulberry32 (a 32-bit generator, public domain) for uniforms, Box–Muller for standard
 * normals, and a chi-square variate as a sum of squared normals (exact, fine for the
 * small degrees of freedom of a monthly model).
 */

import { fnv1a32, mulberry32Open } from "../core/random.ts";

/** A generator of uniforms in (0, 1). */
export type Uniform = () => number;

/** Uniforms in (0, 1) for the scenarios (never 0: Box–Muller takes log(u)). */
export const scenarioUniforms: (seed: number) => Uniform = mulberry32Open;

/** A 32-bit seed from a string, so each meter gets its own stream. */
export const seedFromString: (text: string, base?: number) => number = fnv1a32;

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
