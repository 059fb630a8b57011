import { describe, expect, it } from "vitest";
import { Rng, mulberry32, seedFromKey } from "../../scripts/demo/prng.ts";

describe("mulberry32", () => {
  it("matches an independent Python port of the published C code (seeds 42 and 0)", () => {
    // Values computed with a separate Python implementation of mulberry32 (32-bit masking by hand).
    const a = mulberry32(42);
    expect([a(), a(), a()]).toEqual([0.6011037519201636, 0.44829055899754167, 0.8524657934904099]);
    const b = mulberry32(0);
    expect([b(), b(), b()]).toEqual([0.26642920868471265, 0.0003297457005828619, 0.2232720274478197]);
  });

  it("is deterministic for a seed and differs between seeds", () => {
    const x = mulberry32(7);
    const y = mulberry32(7);
    const z = mulberry32(8);
    const xs = Array.from({ length: 50 }, () => x());
    expect(Array.from({ length: 50 }, () => y())).toEqual(xs);
    expect(Array.from({ length: 50 }, () => z())).not.toEqual(xs);
  });

  it("stays in [0, 1) with mean near 1/2 (100,000 draws; 3 sigma of the mean is 0.0027)", () => {
    const u = mulberry32(12345);
    let sum = 0;
    let lo = 1;
    let hi = 0;
    for (let i = 0; i < 100_000; i++) {
      const v = u();
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
      sum += v;
    }
    expect(lo).toBeGreaterThanOrEqual(0);
    expect(hi).toBeLessThan(1);
    expect(Math.abs(sum / 100_000 - 0.5)).toBeLessThan(0.005);
  });
});

describe("seedFromKey (FNV-1a 32-bit)", () => {
  it("matches the FNV-1a test vectors for '', 'a' and 'foobar'", () => {
    // Published FNV-1a 32-bit vectors (from memory), re-checked with a Python port.
    expect(seedFromKey("")).toBe(0x811c9dc5);
    expect(seedFromKey("a")).toBe(0xe40c292c);
    expect(seedFromKey("foobar")).toBe(0xbf9cf968);
  });
});

describe("Rng", () => {
  it("draws integers inclusive of both ends and normals with unit variance", () => {
    const r = new Rng(99);
    const seen = new Set<number>();
    for (let i = 0; i < 2000; i++) seen.add(r.int(1, 3));
    expect([...seen].sort()).toEqual([1, 2, 3]);
    let s = 0;
    let s2 = 0;
    const n = 50_000;
    for (let i = 0; i < n; i++) {
      const z = r.normal();
      s += z;
      s2 += z * z;
    }
    // Sample mean sd = 1/sqrt(n) ≈ 0.0045; sample variance sd ≈ sqrt(2/n) ≈ 0.0063.
    expect(Math.abs(s / n)).toBeLessThan(0.02);
    expect(Math.abs(s2 / n - 1)).toBeLessThan(0.03);
  });
});
