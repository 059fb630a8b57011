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
    this.errorSeen = true;
  }

  /** Set by `error`, so `failed` does not rescan every issue (it is asked once per charge). */
  private errorSeen = false;

  warning(node: AnyNode, message: string, hint?: string): void {
    const { line, column } = this.pos(node);
    this.issues.push({ file: this.file, line, column, severity: "warning", message, hint });
  }

  get failed(): boolean {
    return this.errorSeen || this.issues.some((i) => i.severity === "error");
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
/**
 * Largest magnitude of any number in a tariff file (rate, fixed amount, block size, minimum).
 * No real rate or charge comes near a billion, and keeping every factor below it keeps a
 * priced line (rate × usage up to 1e12) far inside the range where doubles are finite and
 * cents are exact: `1e308` used to price every bill to NaN (issue 16).
 */
const MAX_TARIFF_NUMBER = 1e9;
const MAX_TARIFF_NUMBER_TEXT = "1,000,000,000";

export function readNumber(c: Checker, f: Field, what: string, rule: NumberRule = {}): number | null {
  const node = f.value;
  if (!isScalar(node) || typeof node.value !== "number" || !Number.isFinite(node.value)) {
    const shown = isScalar(node) ? `'${String(node.value)}'` : "nothing or a list/mapping";
    c.error(where(f), `${what} must be a number, got ${shown}`, "write a plain number such as 0.125 (no units, currency signs, % or thousands separators)");
    return null;
  }
  const v = node.value;
  const bounds: string[] = [];
  if (Math.abs(v) > MAX_TARIFF_NUMBER) bounds.push(`between -${MAX_TARIFF_NUMBER_TEXT} and ${MAX_TARIFF_NUMBER_TEXT}`);
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

/**
 * Deepest nesting accepted in a YAML file (flow brackets, or block indentation in steps of one
 * space). A tariff nests about six levels; the YAML parser recurses once per level and overflows
 * the stack near a few thousand, so 64 flow levels and 256 columns of indentation are generous
 * for real files and far from the crash (common practice: parsers such as Go's yaml.v3 cap depth).
 */
export const MAX_YAML_FLOW_DEPTH = 64;
const MAX_YAML_INDENT = 256;

/** Aliases (`*name`) accepted in one file; the yaml package's own default for expansion (`maxAliasCount`). */
export const MAX_YAML_ALIASES = 100;

/**
 * Checks YAML text against the nesting and alias limits before parsing, so a hostile file
 * ("billion laughs" aliases, ten thousand nested brackets) gets a message instead of a stack
 * overflow or a memory blow-up. Returns the first problem with its position, or null.
 * The scan skips quoted strings and comments; it is linear in the text.
 * @example yamlLimitProblem("a: " + "[".repeat(100)) // { line: 1, column: 68, … }
 */
export function yamlLimitProblem(text: string): { line: number; column: number; message: string; hint: string } | null {
  let line = 1;
  let col = 0;
  let depth = 0;
  let aliases = 0;
  let atLineStart = true;
  let indent = 0;
  for (let i = 0; i < text.length; i++) {
    const ch = text.charCodeAt(i);
    col++;
    if (ch === 10) {
      line++;
      col = 0;
      atLineStart = true;
      indent = 0;
      continue;
    }
    if (atLineStart) {
      if (ch === 32) {
        indent++;
        if (indent > MAX_YAML_INDENT) {
          return { line, column: col, message: `indentation deeper than ${MAX_YAML_INDENT} spaces`, hint: "a tariff or settings file nests a few levels; check the indentation" };
        }
        continue;
      }
      atLineStart = false;
    }
    if (ch === 35 && (i === 0 || text.charCodeAt(i - 1) === 32 || text.charCodeAt(i - 1) === 10 || text.charCodeAt(i - 1) === 9)) {
      // Comment to end of line.
      const nl = text.indexOf("\n", i);
      if (nl === -1) break;
      col += nl - i - 1;
      i = nl - 1;
      continue;
    }
    const before = i === 0 ? 32 : text.charCodeAt(i - 1);
    const opensScalar = before === 32 || before === 9 || before === 10 || before === 91 || before === 123 || before === 44 || before === 58 || before === 45;
    if ((ch === 34 || ch === 39) && opensScalar) {
      // Quoted scalar (a quote inside a plain scalar, as in "Customer's", opens nothing):
      // skip to the closing quote ("" escapes with \, '' doubles).
      let j = i + 1;
      for (; j < text.length; j++) {
        const c = text.charCodeAt(j);
        if (ch === 34 && c === 92) j++;
        else if (c === ch) {
          if (ch === 39 && text.charCodeAt(j + 1) === 39) j++;
          else break;
        } else if (c === 10) {
          line++;
          col = 0;
        }
      }
      col += j - i;
      i = j;
      continue;
    }
    if (ch === 91 || ch === 123) {
      depth++;
      if (depth > MAX_YAML_FLOW_DEPTH) {
        return { line, column: col, message: `brackets nested deeper than ${MAX_YAML_FLOW_DEPTH} levels`, hint: "a tariff or settings file nests a few levels; check for unbalanced [ or {" };
      }
    } else if (ch === 93 || ch === 125) {
      if (depth > 0) depth--;
    } else if (ch === 42) {
      const prev = i === 0 ? 32 : text.charCodeAt(i - 1);
      if (prev === 32 || prev === 9 || prev === 91 || prev === 123 || prev === 44 || prev === 58) {
        aliases++;
        if (aliases > MAX_YAML_ALIASES) {
          return { line, column: col, message: `more than ${MAX_YAML_ALIASES} aliases (*name)`, hint: "aliases repeat a block; write the values out, or use fewer aliases" };
        }
      }
    }
  }
  return null;
}
