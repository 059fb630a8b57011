import { describe, expect, it } from "vitest";
import { deserialize, serialize } from "node:v8";
import { deserializeOwned } from "../../src/core/deserializeOwned.ts";

describe("deserializeOwned", () => {
  const value = {
    fitted: new Float64Array([1.5, 2.5, 3.5]),
    counts: new Int32Array([4, -5]),
    mask: new Uint8Array([1, 0, 1]),
    raw: Buffer.from("bytes"),
    view: new DataView(new Uint8Array([9, 8, 7, 6]).buffer),
    nested: [{ days: new Float64Array([7]) }],
    map: new Map([["a", new Float64Array([1])]]),
    text: "kept",
  };
  const bytes = serialize(value);

  it("reads what node:v8's deserialize reads", () => {
    expect(deserializeOwned(bytes)).toEqual(deserialize(bytes));
  });

  it("gives arrays that own their memory, not views into the bytes read (which node:v8's own deserializer returns)", () => {
    const shared = deserialize(bytes) as typeof value;
    expect(shared.fitted.buffer.byteLength).toBeGreaterThan(shared.fitted.byteLength);
    const owned = deserializeOwned(bytes) as typeof value;
    for (const view of [owned.fitted, owned.counts, owned.mask, owned.raw, owned.view, owned.nested[0]!.days, owned.map.get("a")!]) {
      expect(view.buffer.byteLength).toBe(view.byteLength);
    }
    expect(Buffer.isBuffer(owned.raw)).toBe(true);
    expect(owned.view.getUint8(2)).toBe(7);
  });
});
