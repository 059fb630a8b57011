import { mkdtempSync, readdirSync, rmSync, truncateSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import type { PricedBill } from "../../src/tariff/index.ts";
import { PricedShelf } from "../../src/pipeline/pricedShelf.ts";
import { contentDigestOf, withContentDigest } from "../../src/core/contentHash.ts";

const freshDir = () => mkdtempSync(join(tmpdir(), "ohmbook-priced-shelf-test-"));

const pricedArb: fc.Arbitrary<PricedBill> = fc.record({
  computed: fc.option(
    fc.record({
      total: fc.double({ noNaN: true, noDefaultInfinity: true }),
      exact: fc.boolean(),
      billingDemandKw: fc.option(fc.double({ min: 0, max: 1e4, noNaN: true })),
      lines: fc.array(fc.record({ label: fc.string(), amount: fc.double({ noNaN: true, noDefaultInfinity: true }), status: fc.constantFrom("exact", "estimated", "needs-interval-data") }), { maxLength: 4 }),
    }),
  ),
  error: fc.option(fc.string()),
  meteredUsage: fc.option(fc.double({ noNaN: true, noDefaultInfinity: true })),
}) as unknown as fc.Arbitrary<PricedBill>;

/** A few buildings' maps; bill ids drawn from a small set so a later building may repeat one. */
const buildingsArb = fc.array(fc.array(fc.tuple(fc.constantFrom("b1", "b2", "b3", "b4", "b5", "b6", "b7"), pricedArb), { maxLength: 5 }).map((pairs) => new Map(pairs)), { maxLength: 9 });

describe("PricedShelf", () => {
  it("reads back what a Map filled building after building holds: same keys in the same order, equal values, same rule for a repeated id", () => {
    fc.assert(
      fc.property(buildingsArb, (buildings) => {
        const merged = new Map<string, PricedBill>();
        for (const b of buildings) for (const [id, p] of b) merged.set(id, p);
        const dir = freshDir();
        try {
          const shelf = PricedShelf.fill(dir, buildings);
          expect(shelf.size).toBe(merged.size);
          expect([...shelf.keys()]).toEqual([...merged.keys()]);
          expect([...shelf]).toEqual([...merged]);
          expect([...shelf.values()]).toEqual([...merged.values()]);
          for (const [id, p] of merged) {
            expect(shelf.has(id)).toBe(true);
            expect(shelf.get(id)).toEqual(p);
          }
          expect(shelf.get("not a bill")).toBeUndefined();
          expect(shelf.has("not a bill")).toBe(false);
          // Bills of many buildings in any order (one record read at a time) on a fresh shelf.
          const again = PricedShelf.fill(dir, buildings);
          const ids = [...merged.keys()].reverse();
          for (let k = 0; k < ids.length; k += 2) expect(again.get(ids[k]!)).toEqual(merged.get(ids[k]!));
          for (const id of ids) expect(again.get(id)).toEqual(merged.get(id));
          const seen: [string, PricedBill][] = [];
          shelf.forEach((v, k) => seen.push([k, v]));
          expect(seen).toEqual([...merged]);
          // Each building's own map, including a bill a later building repeats.
          buildings.forEach((b, i) => {
            const own = shelf.building(i);
            expect(own.size).toBe(b.size);
            expect([...own]).toEqual([...b]);
            for (const [id, p] of b) expect(own.get(id)).toEqual(p);
            expect(own.get("not a bill")).toBeUndefined();
          });
        } finally {
          rmSync(dir, { recursive: true, force: true });
        }
      }),
      { numRuns: 60 },
    );
  });

  it("keeps only the last few buildings read, so sweeping a portfolio does not hold it all", () => {
    const dir = freshDir();
    try {
      const buildings = Array.from({ length: 10 }, (_, i) => new Map([[`bill-${i}`, { computed: null, error: `no tariff ${i}` } as PricedBill]]));
      const shelf = PricedShelf.fill(dir, buildings);
      const first = shelf.read(0);
      expect(shelf.read(0)).toBe(first); // kept
      for (let i = 1; i < 10; i++) shelf.read(i);
      expect(shelf.read(0)).not.toBe(first); // read again from its file
      expect(shelf.read(0)).toEqual(first);
      expect(readdirSync(dir).sort()).toEqual(buildings.map((_, i) => `priced-${i}.v8`).sort());
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("keeps the content digest the analysis recorded for a bill's pricing", () => {
    const dir = freshDir();
    try {
      const named = withContentDigest({ computed: null, error: "a" } as PricedBill, "digest-of-a");
      const plain = { computed: null, error: "b" } as PricedBill;
      const shelf = PricedShelf.fill(dir, [new Map([["a", named], ["b", plain]])]);
      expect(contentDigestOf(shelf.get("a")!)).toBe("digest-of-a");
      expect(contentDigestOf(shelf.get("b")!)).toBeUndefined();
      expect(contentDigestOf(shelf.building(0).get("a")!)).toBe("digest-of-a");
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("names the scratch file when it was damaged during the build, instead of returning nothing", () => {
    const dir = freshDir();
    try {
      const shelf = PricedShelf.fill(dir, [new Map([["bill-1", { computed: null, error: "x".repeat(200) } as PricedBill]])]);
      truncateSync(join(dir, "priced-0.v8"), 10);
      expect(() => shelf.get("bill-1")).toThrow(/priced-0\.v8/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
