/** Which rows of a long per-building list the index shows; the whole list has a page of its own. */

/**
 * Longest per-building list the index shows whole. A row is about 45 px tall at 1,440 px wide,
 * so 20 rows fill about one laptop screen; on a 390 px phone each row stacks into a block of
 * about 360 px, and longer lists bury the sections below them (measured on a 48-building
 * portfolio: the two lists made the index 50,000 px tall on a phone). The demo's 8 buildings
 * stay whole.
 */
export const INDEX_LIST_WHOLE_MAX = 20;

/**
 * Rows a longer list shows on the index: the ten that matter most, as the index lists the ten
 * largest claims (INDEX_CLAIM_LIMIT); the rest are one link away.
 */
export const INDEX_LIST_SHOWN = 10;

/**
 * The rows the index shows of a per-building list: null when the list is short enough to show
 * whole (at most INDEX_LIST_WHOLE_MAX rows), else the INDEX_LIST_SHOWN rows first by `rank`
 * (which must order every pair, e.g. by name on ties), in rank order. Does not mutate `rows`.
 * @example indexSubset(costs, (a, b) => b - a) // null for 20 rows; the 10 largest of 21
 */
export function indexSubset<T>(rows: readonly T[], rank: (a: T, b: T) => number): T[] | null {
  if (rows.length <= INDEX_LIST_WHOLE_MAX) return null;
  return [...rows].sort(rank).slice(0, INDEX_LIST_SHOWN);
}
