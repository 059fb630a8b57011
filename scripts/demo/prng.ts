/**
 * A tiny seeded pseudo-random generator for the demo portfolio, so every run of the
 * generator writes byte-identical files. Algorithm: mulberry32 (a 32-bit multiply-xorshift
 * generator published as public-domain C by Tommy Ettinger); statistical quality is ample
 * for invented demo data, never for anything security related.
 */

/**
 * Returns a function yielding uniform numbers in [0, 1) from a 32-bit seed.
 * @example const u = mulberry32(42); u(); // same sequence on every run
 */
export function mulberry32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Derives a 32-bit seed from a text key (FNV-1a), so each meter or station gets its own
 * independent stream and adding a meter does not shift the numbers of the others.
 * @example seedFromKey("TWR-E") // always the same integer
 */
export function seedFromKey(key: string): number {
  let hash = 0x811c9dc5;
  for (let i = 0; i < key.length; i++) {
    hash ^= key.charCodeAt(i);
    hash = Math.imul(hash, 0x01000193);
  }
  return hash >>> 0;
}

/** Convenience wrapper: uniform, integer, normal and choice draws from one stream. */
export class Rng {
  private readonly uniform01: () => number;

  constructor(seed: number) {
    this.uniform01 = mulberry32(seed);
  }

  /** Stream keyed by a name (see seedFromKey). */
  static forKey(key: string): Rng {
    return new Rng(seedFromKey(key));
  }

  /** Uniform in [0, 1). */
  next(): number {
    return this.uniform01();
  }

  /** Uniform in [lo, hi). */
  uniform(lo: number, hi: number): number {
    return lo + (hi - lo) * this.uniform01();
  }

  /** Integer uniform in [lo, hi] inclusive. */
  int(lo: number, hi: number): number {
    return lo + Math.floor(this.uniform01() * (hi - lo + 1));
  }

  /** Standard normal draw by the Box–Muller transform. */
  normal(): number {
    const u1 = Math.max(this.uniform01(), 1e-12);
    const u2 = this.uniform01();
    return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
  }
}
