/** Matching printed bill lines to computed tariff charges. */
import type { BillLine } from "../../domain/types.ts";
import type { ComputedLine } from "../../tariff/index.ts";

/**
 * Label key: case- and space-insensitive, as the input contract says.
 * @example labelKey("  Customer   Charge ") === labelKey("customer charge") // true
 */
function labelKey(label: string): string {
  return label.toLowerCase().replace(/\s+/g, "");
}

export interface LineGroup {
  label: string;
  printed: number | null;
  computed: number | null;
  /** Every computed line with this label is `exact`. */
  exact: boolean;
  computedLines: ComputedLine[];
}

/** Printed and computed amounts grouped by label key, in computed order then printed order. */
export function groupLines(printed: BillLine[], computed: ComputedLine[]): LineGroup[] {
  const groups = new Map<string, LineGroup>();
  for (const c of computed) {
    const key = labelKey(c.label);
    const g = groups.get(key) ?? { label: c.label, printed: null, computed: null, exact: true, computedLines: [] };
    g.computed = (g.computed ?? 0) + c.amount;
    g.exact = g.exact && c.status === "exact";
    g.computedLines.push(c);
    groups.set(key, g);
  }
  for (const p of printed) {
    const key = labelKey(p.label);
    const g = groups.get(key) ?? { label: p.label, printed: null, computed: null, exact: true, computedLines: [] };
    g.printed = (g.printed ?? 0) + p.amount;
    groups.set(key, g);
  }
  return [...groups.values()];
}
