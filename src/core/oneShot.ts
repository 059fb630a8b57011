/**
 * An iterable that can be iterated once and then lets go of its source: whoever still holds the
 * wrapper (a caller's local, a parameter) no longer keeps the source, or what the source's
 * closure holds, alive. Used for the data files, whose maker holds the forecast's scenario
 * matrices (~100 MB at 1,000 buildings) that nothing needs once the files are written.
 * @example const once = oneShot([1, 2]); [...once]; [...once] // [1, 2] then throws
 */
export function oneShot<T>(source: Iterable<T>): Iterable<T> {
  let held: Iterable<T> | null = source;
  return {
    [Symbol.iterator]() {
      if (held === null) throw new Error("this iterable was already iterated once");
      const iterator = held[Symbol.iterator]();
      held = null;
      return iterator;
    },
  };
}
