import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { createHash } from "node:crypto";
import { contentDigestOf, contentHash, hashedOnce, withContentDigest } from "../../src/core/contentHash.ts";

/**
 * The recipe as first written, one `Hash.update` per piece (kept here as the reference): the
 * buffered contentHash must hash exactly the same bytes, or every cache key would change.
 */
function referenceHash(value: unknown): string {
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

const leaf = fc.oneof(
  { arbitrary: fc.double(), weight: 8 },
  { arbitrary: fc.string({ unit: "binary" }), weight: 8 },
  { arbitrary: fc.string({ minLength: 20_000, maxLength: 30_000 }), weight: 1 },
  { arbitrary: fc.uint8Array({ minLength: 0, maxLength: 70_000 }), weight: 1 },
  fc.boolean(),
  fc.constant(null),
  fc.constant(undefined),
  fc.bigInt(),
  fc.date({ noInvalidDate: true }),
  fc.float64Array({ maxLength: 20 }),
);
const value = fc.letrec((tie) => ({
  node: fc.oneof({ depthSize: "small" }, leaf, fc.array(tie("node")), fc.dictionary(fc.string(), tie("node")), fc.array(fc.tuple(fc.string(), tie("node"))).map((pairs) => new Map(pairs)), fc.array(tie("node")).map((xs) => new Set(xs))),
})).node;

describe("contentHash", () => {
  it("hashes the same bytes as one update per piece, for any value (strings with lone surrogates, long strings and arrays that overflow the buffer)", () => {
    fc.assert(fc.property(value, (v) => contentHash(v) === referenceHash(v)), { numRuns: 200 });
  });

  it("keeps the keys of earlier builds: a fixed value's hash is pinned", () => {
    // Value computed with the one-update-per-piece recipe at commit ed505b2.
    const v = { b: [1, 2.5, "x", null, undefined, true], a: new Map([["k", new Float64Array([1, Number.NaN])]]), d: new Date(0) };
    expect(contentHash(v)).toBe(referenceHash(v));
    expect(contentHash(v)).toMatchInlineSnapshot(`"eb5f1ed6d2f9826f6d88d7034744b9f0090469cb4aab2d6bd82e6e410c50aa2c"`);
  });

  it("does not depend on key order or on function members", () => {
    expect(contentHash({ a: 1, b: [2], f: () => 1 })).toBe(contentHash({ b: [2], a: 1 }));
    expect(contentHash(1)).not.toBe(contentHash("1"));
  });

  it("hashes a value with a recorded digest by that digest: the same wherever it sits, different from its content walked and from another digest", () => {
    const readings = { meterId: "M1", values: new Float64Array([1, 2, 3]) };
    const digested = withContentDigest({ ...readings }, "d1");
    expect(contentDigestOf(digested)).toBe("d1");
    expect(contentHash({ s: digested, n: 1 })).toBe(contentHash({ n: 1, s: withContentDigest({ ...readings }, "d1") }));
    expect(contentHash({ s: digested })).not.toBe(contentHash({ s: readings }));
    expect(contentHash({ s: digested })).not.toBe(contentHash({ s: withContentDigest({ ...readings }, "d2") }));
    // The digest is not mistaken for a string of the same text.
    expect(contentHash([digested])).not.toBe(contentHash(["d1"]));
    // A copy has no digest: it is walked.
    expect(contentHash({ ...digested })).toBe(contentHash(readings));
  });

  it("hashedOnce records the value's own hash: values of equal content hash alike, and any change of content changes the hash", () => {
    fc.assert(
      fc.property(fc.array(fc.double(), { minLength: 1, maxLength: 30 }), fc.nat(), (xs, at) => {
        const a = hashedOnce({ id: "B1", xs: [...xs] });
        const b = hashedOnce({ id: "B1", xs: [...xs] });
        expect(contentDigestOf(a)).toBe(contentHash({ id: "B1", xs }));
        expect(contentHash([a])).toBe(contentHash([b]));
        const changed = [...xs];
        const i = at % xs.length;
        changed[i] = Object.is(changed[i], 1) ? 2 : 1;
        expect(contentHash([hashedOnce({ id: "B1", xs: changed })])).not.toBe(contentHash([a]));
      }),
    );
  });
});
