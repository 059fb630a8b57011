/**
 * Makes equal strings one string in memory. Results that cross from a worker thread (structured
 * clone) or from a cache file arrive with a fresh copy of every string, so the hundred thousand
 * priced bills of a thousand-building portfolio each carried their own "exact", "kWh", "USD" and
 * note texts. Walking the results once and replacing each string by the first equal one seen
 * keeps one copy per distinct text.
 */

/** Replaces, in place, every string value in `value` (objects, arrays, Map values) by its entry in `table`; returns `value`. */
export function internStrings<T>(value: T, table: Map<string, string>): T {
  visit(value, table);
  return value;
}

function canonical(text: string, table: Map<string, string>): string {
  const known = table.get(text);
  if (known !== undefined) return known;
  table.set(text, text);
  return text;
}

function visit(value: unknown, table: Map<string, string>): void {
  if (value === null || typeof value !== "object" || ArrayBuffer.isView(value) || value instanceof Date) return;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const item: unknown = value[i];
      if (typeof item === "string") value[i] = canonical(item, table);
      else visit(item, table);
    }
    return;
  }
  if (value instanceof Map) {
    for (const [key, item] of value) {
      if (typeof item === "string") value.set(key, canonical(item, table));
      else visit(item, table);
    }
    return;
  }
  if (value instanceof Set) return;
  const record = value as Record<string, unknown>;
  for (const key of Object.keys(record)) {
    const item = record[key];
    if (typeof item === "string") record[key] = canonical(item, table);
    else visit(item, table);
  }
}
