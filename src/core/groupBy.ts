/**
 * `items` grouped by `keyOf`, each group in the items' order; items without a key are left out.
 * One pass, for cutting portfolio-wide tables by meter or building (filtering the whole table
 * once per building is quadratic: a thousand buildings have about a hundred thousand bills).
 * @example groupBy([{ m: "E1" }, { m: "G1" }, { m: "E1" }], (r) => r.m).get("E1")!.length // 2
 */
export function groupBy<T>(items: readonly T[], keyOf: (item: T) => string | undefined): Map<string, T[]> {
  const groups = new Map<string, T[]>();
  for (const item of items) {
    const key = keyOf(item);
    if (key === undefined) continue;
    const group = groups.get(key);
    if (group) group.push(item);
    else groups.set(key, [item]);
  }
  return groups;
}
