/**
 * A read-only map whose values are read or made when asked for (files on disk, a slice of
 * something larger): a subclass gives `size`, `has`, `get` and `keys`, and this gives the rest of
 * ReadonlyMap's API in key order, one value at a time, so iterating never holds every value at once.
 */
export abstract class OnDemandMap<V> implements ReadonlyMap<string, V> {
  abstract readonly size: number;
  abstract has(key: string): boolean;
  abstract get(key: string): V | undefined;
  abstract keys(): MapIterator<string>;

  /** The value of a key `keys` gave, while iterating in key order (a subclass may read ahead). */
  protected valueInOrder(key: string): V {
    return this.get(key)!;
  }

  entries(): MapIterator<[string, V]> {
    return inOrder(this.keys(), (key) => [key, this.valueInOrder(key)] as [string, V]);
  }

  values(): MapIterator<V> {
    return inOrder(this.keys(), (key) => this.valueInOrder(key));
  }

  [Symbol.iterator](): MapIterator<[string, V]> {
    return this.entries();
  }

  forEach(callback: (value: V, key: string, map: ReadonlyMap<string, V>) => void, thisArg?: unknown): void {
    for (const [key, value] of this.entries()) callback.call(thisArg, value, key, this);
  }
}

/** Lazily, one key at a time (Node 20 has no iterator helpers). */
function inOrder<T>(keys: Iterable<string>, read: (key: string) => T): MapIterator<T> {
  return (function* () {
    for (const key of keys) yield read(key);
  })() as unknown as MapIterator<T>;
}
