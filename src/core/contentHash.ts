/**
 * Content hashes for caches: a value hashed by what it holds, and a folder by its files. Kept in
 * core because the analysis cache (pipeline) and the page cache (site) key on the same recipe.
 */
import { createHash, type Hash } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";

/**
 * SHA-256 of a value's content: numbers by their 64-bit pattern, strings, arrays, Map and Set in
 * order, typed arrays byte for byte, objects by sorted keys (functions skipped). Unlike
 * node:v8's serializer, it does not depend on how V8 happens to store a number (small integer
 * or double), which changes as code runs over an object.
 * @example contentHash({ a: 1, b: [2] }) === contentHash({ b: [2], a: 1 }) // true
 */
export function contentHash(value: unknown): string {
  const hash = createHash("sha256");
  const out = new HashInput(hash);
  const walk = (v: unknown): void => {
    let digest: string | undefined;
    if (v === null) out.byte(0x6e); // n
    else if (v === undefined) out.byte(0x75); // u
    else if (typeof v === "object" && (digest = digests.get(v)) !== undefined) {
      out.tagged(0x23, digest.length); // #<length>: (no other value starts so)
      out.text(digest);
    }
    else if (typeof v === "boolean") out.byte(v ? 0x54 : 0x46); // T F
    else if (typeof v === "number") {
      out.byte(0x64); // d
      out.double(Number.isNaN(v) ? Number.NaN : v);
    } else if (typeof v === "string") {
      out.tagged(0x73, v.length); // s<length>:
      out.text(v);
    } else if (typeof v === "bigint") out.text(`b${v.toString()};`);
    else if (typeof v === "function" || typeof v === "symbol") return;
    else if (ArrayBuffer.isView(v)) {
      out.text(`a${v.constructor.name}${v.byteLength}:`);
      out.bytes(new Uint8Array(v.buffer, v.byteOffset, v.byteLength));
    } else if (Array.isArray(v)) {
      out.byte(0x5b); // [
      out.digits(v.length);
      for (const x of v) walk(x);
      out.byte(0x5d); // ]
    } else if (v instanceof Map) {
      out.byte(0x4d); // M
      out.digits(v.size);
      for (const [k, x] of v) {
        walk(k);
        walk(x);
      }
    } else if (v instanceof Set) {
      out.byte(0x53); // S
      out.digits(v.size);
      for (const x of v) walk(x);
    } else if (v instanceof Date) out.text(`D${v.getTime()};`);
    else {
      const record = v as Record<string, unknown>;
      const keys: string[] = [];
      for (const k of Object.keys(record)) if (typeof record[k] !== "function") keys.push(k);
      keys.sort();
      out.byte(0x7b); // {
      out.digits(keys.length);
      for (const k of keys) {
        out.tagged(0x6b, k.length); // k<length>:
        out.text(k);
        walk(record[k]);
      }
      out.byte(0x7d); // }
    }
  };
  try {
    walk(value);
    out.flush();
  } finally {
    out.release();
  }
  return hash.digest("hex");
}

/** The buffer HashInput lends out (undefined while lent). */
let sharedBuffer: Buffer | undefined = Buffer.allocUnsafe(1 << 16);

/** Digests standing for values in contentHash (withContentDigest); weak, so a value let go takes its digest with it. */
const digests = new WeakMap<object, string>();

/**
 * Records `digest` as what contentHash hashes for `value` instead of walking it, and returns
 * `value`: for large values that many keys contain (a meter's readings, read again for every key
 * that holds them). `digest` must change whenever `value`'s content would (contentHash(value)
 * taken once, or a hash of the inputs a pure computation made `value` from), and `value` must not
 * change afterwards: a changed value would keep its old digest. A value with a digest hashes
 * differently from the same content without one: at worst a cache miss, never a wrong hit.
 * @example contentHash({ s: withContentDigest(series, "ab12…") }) // walks { s: "#ab12…" }, not the readings
 */
export function withContentDigest<T extends object>(value: T, digest: string): T {
  digests.set(value, digest);
  return value;
}

/** The digest recorded for `value` by withContentDigest, if any. */
export function contentDigestOf(value: object): string | undefined {
  return digests.get(value);
}

/**
 * `value` with its own contentHash recorded as its digest (withContentDigest): hashed once here,
 * not again by every key that contains it. `value` must not change afterwards.
 * @example for (const bill of bills) hashedOnce(bill)
 */
export function hashedOnce<T extends object>(value: T): T {
  return digests.has(value) ? value : withContentDigest(value, contentHash(value));
}

/**
 * Bytes for a hash, gathered in a buffer and handed over in blocks: each `Hash.update` call
 * costs about a microsecond whatever its size, and a value's walk makes millions of tiny ones
 * (measured: 0.8 s of a 128-building rebuild). Tags, lengths and short ASCII strings are
 * written byte by byte here (a native Buffer.write per piece cost more than the hashing);
 * anything else goes through Buffer.write as UTF-8. The bytes hashed are exactly those the tiny
 * updates gave (strings as UTF-8), so keys do not change (test/core/contentHash.test.ts).
 */
class HashInput {
  private readonly buffer: Buffer;
  private used = 0;

  /**
   * One buffer for every hash taken: allocating 64 KiB per call cost more than hashing the small
   * values most keys are. A hash taken while another is being taken (a getter that hashes) gets
   * a buffer of its own; `release` hands the shared one back.
   */
  constructor(private readonly hash: Hash) {
    if (sharedBuffer !== undefined) {
      this.buffer = sharedBuffer;
      sharedBuffer = undefined;
    } else this.buffer = Buffer.allocUnsafe(1 << 16);
  }

  release(): void {
    sharedBuffer = this.buffer;
  }

  byte(b: number): void {
    if (this.used === this.buffer.length) this.flush();
    this.buffer[this.used++] = b;
  }

  /** A non-negative integer in decimal ASCII (as String(n) gives it). */
  digits(n: number): void {
    if (n < 10) this.byte(0x30 + n);
    else this.ascii(String(n));
  }

  /** `<tag><length>:` (e.g. `s12:` before a string of 12 code units). */
  tagged(tag: number, length: number): void {
    this.byte(tag);
    this.digits(length);
    this.byte(0x3a);
  }

  /** A string known to be ASCII (digits), short. */
  private ascii(s: string): void {
    if (this.buffer.length - this.used < s.length) this.flush();
    for (let i = 0; i < s.length; i++) this.buffer[this.used++] = s.charCodeAt(i);
  }

  text(s: string): void {
    const n = s.length;
    // A UTF-16 code unit takes at most 3 bytes of UTF-8 (a surrogate pair, 2 units, takes 4).
    if (n * 3 > this.buffer.length - this.used) {
      this.flush();
      if (n * 3 > this.buffer.length) {
        this.hash.update(s);
        return;
      }
    }
    if (n <= 64) {
      // Short strings are mostly ASCII: one byte per code unit, no native call.
      const start = this.used;
      const buffer = this.buffer;
      let i = 0;
      for (; i < n; i++) {
        const c = s.charCodeAt(i);
        if (c >= 0x80) break;
        buffer[start + i] = c;
      }
      if (i === n) {
        this.used = start + n;
        return;
      }
    }
    this.used += this.buffer.write(s, this.used, "utf8");
  }

  double(x: number): void {
    if (this.buffer.length - this.used < 8) this.flush();
    this.buffer.writeDoubleLE(x, this.used);
    this.used += 8;
  }

  bytes(b: Uint8Array): void {
    if (b.length > this.buffer.length - this.used) {
      this.flush();
      if (b.length > this.buffer.length) {
        this.hash.update(b);
        return;
      }
    }
    this.buffer.set(b, this.used);
    this.used += b.length;
  }

  flush(): void {
    if (this.used > 0) this.hash.update(this.buffer.subarray(0, this.used));
    this.used = 0;
  }
}

/** Every file under `dir` whose name matches `include` (relative path and contents), sorted by name, into `hash`. */
export function hashFolder(hash: Hash, dir: string, include: RegExp, prefix = ""): void {
  for (const entry of readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : 1))) {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) hashFolder(hash, path, include, `${prefix}${entry.name}/`);
    else if (include.test(entry.name)) {
      hash.update(`${prefix}${entry.name}\0`);
      hash.update(readFileSync(path));
      hash.update("\0");
    }
  }
}
