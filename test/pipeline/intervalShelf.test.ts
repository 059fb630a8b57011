import { existsSync, mkdtempSync, readdirSync, truncateSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import type { IntervalSeries } from "../../src/domain/types.ts";
import { IntervalShelf } from "../../src/pipeline/intervalShelf.ts";
import { contentDigestOf, contentHash } from "../../src/core/contentHash.ts";

const seriesArb = fc.array(fc.double({ noDefaultInfinity: false, noNaN: false }), { maxLength: 300 }).map((values) => ({
  intervalMinutes: 15,
  startMs: Float64Array.from(values, (_, i) => 1_700_000_000_000 + i * 900_000),
  values: Float64Array.from(values),
}));

const freshDir = () => mkdtempSync(join(tmpdir(), "ohmbook-shelf-test-"));

describe("IntervalShelf", () => {
  it("gives back every series bit for bit, in the same key order, with Map's read API", () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.string({ minLength: 1, maxLength: 8 }), { maxLength: 6 }), fc.array(seriesArb, { minLength: 6, maxLength: 6 }), (ids, list) => {
        const source = new Map<string, IntervalSeries>(ids.map((id, i) => [id, { meterId: id, ...list[i]! }]));
        const shelf = IntervalShelf.fill(freshDir(), source);
        try {
          expect(shelf.size).toBe(source.size);
          expect([...shelf.keys()]).toEqual([...source.keys()]);
          for (const [id, s] of source) {
            expect(shelf.has(id)).toBe(true);
            const got = shelf.get(id)!;
            expect(got.meterId).toBe(s.meterId);
            expect(got.intervalMinutes).toBe(s.intervalMinutes);
            // Bytes, so NaN, -0 and infinities count too.
            expect(Buffer.from(got.startMs.buffer, got.startMs.byteOffset, got.startMs.byteLength)).toEqual(Buffer.from(s.startMs.buffer, s.startMs.byteOffset, s.startMs.byteLength));
            expect(Buffer.from(got.values.buffer, got.values.byteOffset, got.values.byteLength)).toEqual(Buffer.from(s.values.buffer, s.values.byteOffset, s.values.byteLength));
          }
          expect([...shelf].map(([k, v]) => [k, v.values.length])).toEqual([...source].map(([k, v]) => [k, v.values.length]));
          expect([...shelf.values()].map((v) => v.meterId)).toEqual([...source.values()].map((v) => v.meterId));
          const seen: string[] = [];
          shelf.forEach((v, k) => seen.push(`${k}:${v.startMs.length}`));
          expect(seen).toEqual([...source].map(([k, v]) => `${k}:${v.startMs.length}`));
          expect(shelf.has("not a meter")).toBe(false);
          expect(shelf.get("not a meter")).toBeUndefined();
        } finally {
          shelf.dispose();
        }
      }),
      { numRuns: 40 },
    );
  });

  it("reads a series into arrays of its own (not views of a shared or pooled buffer)", () => {
    const dir = freshDir();
    const shelf = IntervalShelf.fill(dir, new Map([["M", { meterId: "M", intervalMinutes: 60, startMs: new Float64Array([1, 2]), values: new Float64Array([3, 4]) }]]));
    const s = shelf.get("M")!;
    expect(s.startMs.buffer).not.toBe(s.values.buffer);
    expect(s.startMs.byteOffset).toBe(0);
    expect(s.startMs.buffer.byteLength).toBe(16);
    shelf.dispose();
  });

  it("keeps nothing in memory but the last few series read: a series read long ago is read again", () => {
    const dir = freshDir();
    const source = new Map<string, IntervalSeries>(Array.from({ length: 10 }, (_, i) => [`M${i}`, { meterId: `M${i}`, intervalMinutes: 15, startMs: new Float64Array([i]), values: new Float64Array([i]) }]));
    const shelf = IntervalShelf.fill(dir, source);
    const first = shelf.get("M0");
    expect(shelf.get("M0")).toBe(first); // kept: asked twice in a row
    for (let i = 1; i < 10; i++) shelf.get(`M${i}`);
    const again = shelf.get("M0")!;
    expect(again).not.toBe(first);
    expect([...again.values]).toEqual([0]);
    shelf.dispose();
  });

  it("dispose removes its files; a file removed under it is reported with its path, not read as zeros", () => {
    const dir = freshDir();
    const shelf = IntervalShelf.fill(dir, new Map([["M", { meterId: "M", intervalMinutes: 15, startMs: new Float64Array([1]), values: new Float64Array([2]) }]]));
    expect(readdirSync(dir).length).toBe(1);
    shelf.dispose();
    expect(existsSync(dir)).toBe(false);
    const dir2 = freshDir();
    const other = IntervalShelf.fill(dir2, new Map([["M", { meterId: "M", intervalMinutes: 15, startMs: new Float64Array([1]), values: new Float64Array([2]) }]]));
    for (const f of readdirSync(dir2)) truncateSync(join(dir2, f), 8);
    expect(() => other.get("M")).toThrow(/scratch file .* is shorter than written/);
    other.dispose();
  });

  it("gives every series read back its content digest: equal for equal readings, changed by any one reading (so every key holding it changes)", () => {
    fc.assert(
      fc.property(seriesArb.filter((s) => s.values.length > 0), fc.nat(), fc.double({ noNaN: true }), (s, at, replacement) => {
        const i = at % s.values.length;
        fc.pre(!Object.is(s.values[i], replacement));
        const source = new Map<string, IntervalSeries>([["M", { meterId: "M", ...s }]]);
        const changedValues = Float64Array.from(s.values);
        changedValues[i] = replacement;
        const changed = new Map<string, IntervalSeries>([["M", { meterId: "M", ...s, values: changedValues }]]);
        const [a, b, c] = [IntervalShelf.fill(freshDir(), source), IntervalShelf.fill(freshDir(), source), IntervalShelf.fill(freshDir(), changed)];
        try {
          expect(a.digestOf("M")).toBe(contentHash(source.get("M")));
          expect(contentDigestOf(a.get("M")!)).toBe(a.digestOf("M"));
          expect(contentHash({ readings: a.get("M") })).toBe(contentHash({ readings: b.get("M") }));
          expect(c.digestOf("M")).not.toBe(a.digestOf("M"));
          expect(contentHash({ readings: c.get("M") })).not.toBe(contentHash({ readings: a.get("M") }));
          expect(a.digestOf("not a meter")).toBeUndefined();
        } finally {
          for (const shelf of [a, b, c]) shelf.dispose();
        }
      }),
      { numRuns: 40 },
    );
  });

  it("takes no digest when told the build takes no cache key, and gives the same readings", () => {
    const source = new Map<string, IntervalSeries>([["M", { meterId: "M", intervalMinutes: 15, startMs: new Float64Array([1, 2]), values: new Float64Array([3, 4]) }]]);
    const plain = IntervalShelf.fill(freshDir(), source, { digests: false });
    const named = IntervalShelf.fill(freshDir(), source);
    try {
      expect(plain.digestOf("M")).toBeUndefined();
      expect(contentDigestOf(plain.get("M")!)).toBeUndefined();
      expect(plain.get("M")).toEqual(named.get("M"));
      expect(contentDigestOf(named.get("M")!)).toBe(contentHash(source.get("M")));
    } finally {
      plain.dispose();
      named.dispose();
    }
  });
});
