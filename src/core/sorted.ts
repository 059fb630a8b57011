/** Searches over sorted numeric arrays (interval instants are sorted UTC epoch ms). */

/** First index i with sorted[i] >= value (binary search over a sorted array). */
export function lowerBound(sorted: ArrayLike<number>, value: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid]! < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
