/**
 * Small helpers for validating a YAML syntax tree while keeping every node's position, so each
 * problem is reported as file:line:column with a hint. Used by the tariff loader.
 */
import { isMap, isScalar, isSeq, type LineCounter, type Node, type Pair, type YAMLMap, type YAMLSeq } from "yaml";
import type { InputIssue } from "../core/issues.ts";
import { trimId } from "../core/trimId.ts";

export type AnyNode = Node | null | undefined;

/** Collects issues against one file. */
export class Checker {
  readonly issues: InputIssue[] = [];
  constructor(
    readonly file: string,
    private readonly lineCounter: LineCounter,
  ) {}

  /** 1-based line and column of a node's first character (0, 0 when unknown). */
  pos(node: AnyNode): { line: number; column: number } {
    const range = node?.range;
    if (!range) return { line: 0, column: 0 };
    const p = this.lineCounter.linePos(range[0]);
    return { line: p.line, column: p.col };
  }

  error(node: AnyNode, message: string, hint?: string): void {
    const { line, column } = this.pos(node);
    this.issues.push({ file: this.file, line, column, severity: "error", message, hint });
  }

  warning(node: AnyNode, message: string, hint?: string): void {
    const { line, column } = this.pos(node);
    this.issues.push({ file: this.file, line, column, severity: "warning", message, hint });
  }

  get failed(): boolean {
    return this.issues.some((i) => i.severity === "error");
  }
}

/** A key of a mapping together with its value node, for pointing at either. */
export interface Field {
  key: Node;
  value: AnyNode;
  name: string;
}

/** Levenshtein distance, for "did you mean" hints. */
function distance(a: string, b: string): number {
  const prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let diag = prev[0];
    prev[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const tmp = prev[j];
      prev[j] = Math.min(prev[j] + 1, prev[j - 1] + 1, diag + (a[i - 1] === b[j - 1] ? 0 : 1));
      diag = tmp;
    }
  }
  return prev[b.length];
}

/** "did you mean 'peak'? " when a known name is close to `name`, else "". */
export function didYouMean(name: string, known: readonly string[]): string {
  let best: string | null = null;
  let bestD = Infinity;
  for (const k of known) {
    const d = distance(name.toLowerCase(), k.toLowerCase());
    if (d < bestD) {
      bestD = d;
      best = k;
    }
  }
  return best !== null && bestD <= Math.max(1, Math.floor(best.length / 3)) ? `did you mean '${best}'? ` : "";
}

/**
 * Reads a mapping's keys, reporting any key not in `allowed` (with the valid keys as a hint).
 * Returns null (after reporting) when the node is not a mapping.
 */
export function readMap(c: Checker, node: AnyNode, allowed: readonly string[], what: string, at?: AnyNode): Map<string, Field> | null {
  if (!isMap(node)) {
    c.error(node ?? at, `${what} must be a mapping of keys to values`, `valid keys: ${allowed.join(", ")}`);
    return null;
  }
  const out = new Map<string, Field>();
  for (const pair of (node as YAMLMap).items as Pair<Node, Node>[]) {
    const key = pair.key;
    if (!isScalar(key) || typeof key.value !== "string") {
      c.error(key, `${what}: keys must be plain names`);
      continue;
    }
    const name = key.value;
    if (!allowed.includes(name)) {
      c.error(key, `unknown key '${name}' in ${what}`, `${didYouMean(name, allowed)}valid keys: ${allowed.join(", ")}`);
      continue;
    }
    out.set(name, { key, value: pair.value, name });
  }
  return out;
}

/** Key/value pairs of a mapping whose keys are free names (seasons, periods, rates). */
export function readNamedMap(c: Checker, node: AnyNode, what: string, at?: AnyNode): Field[] | null {
  if (!isMap(node)) {
    c.error(node ?? at, `${what} must be a mapping of names to values`);
    return null;
  }
  const out: Field[] = [];
  for (const pair of (node as YAMLMap).items as Pair<Node, Node>[]) {
    const key = pair.key;
    if (!isScalar(key) || (typeof key.value !== "string" && typeof key.value !== "number")) {
      c.error(key, `${what}: names must be plain text`);
      continue;
    }
    out.push({ key, value: pair.value, name: String(key.value) });
  }
  return out;
}

/** Items of a sequence, or null (after reporting) when the node is not one. */
export function readSeq(c: Checker, node: AnyNode, what: string, at?: AnyNode): AnyNode[] | null {
  if (!isSeq(node)) {
    c.error(node ?? at, `${what} must be a list`);
    return null;
  }
  return (node as YAMLSeq<Node>).items;
}

/** Where to point for a field's value: the value node, or the key when the value is empty. */
export function where(f: Field): Node {
  return (f.value ?? f.key) as Node;
}

export interface NumberRule {
  min?: number;
  /** Exclusive lower bound. */
  above?: number;
  max?: number;
  integer?: boolean;
}

/** A finite number scalar obeying `rule`, or null after reporting. */
export function readNumber(c: Checker, f: Field, what: string, rule: NumberRule = {}): number | null {
  const node = f.value;
  if (!isScalar(node) || typeof node.value !== "number" || !Number.isFinite(node.value)) {
    const shown = isScalar(node) ? `'${String(node.value)}'` : "nothing or a list/mapping";
    c.error(where(f), `${what} must be a number, got ${shown}`, "write a plain number such as 0.125 (no units, currency signs, % or thousands separators)");
    return null;
  }
  const v = node.value;
  const bounds: string[] = [];
  if (rule.integer && !Number.isInteger(v)) bounds.push("a whole number");
  if (rule.above !== undefined && !(v > rule.above)) bounds.push(`greater than ${rule.above}`);
  if (rule.min !== undefined && v < rule.min) bounds.push(`at least ${rule.min}`);
  if (rule.max !== undefined && v > rule.max) bounds.push(`at most ${rule.max}`);
  if (bounds.length > 0) {
    c.error(node, `${what} is ${v}; it must be ${bounds.join(" and ")}`);
    return null;
  }
  return v;
}

/** A non-empty string scalar, or null after reporting. */
export function readString(c: Checker, f: Field, what: string, hint?: string): string | null {
  const node = f.value;
  if (!isScalar(node) || typeof node.value !== "string" || trimId(node.value) === "") {
    c.error(where(f), `${what} must be text`, hint);
    return null;
  }
  // Same whitespace rule as every id in the CSV files, so `id: X\u00A0` matches meters.csv's X.
  return trimId(node.value);
}

/** A boolean scalar, or null after reporting. */
export function readBool(c: Checker, f: Field, what: string): boolean | null {
  const node = f.value;
  if (!isScalar(node) || typeof node.value !== "boolean") {
    c.error(where(f), `${what} must be true or false`);
    return null;
  }
  return node.value;
}
