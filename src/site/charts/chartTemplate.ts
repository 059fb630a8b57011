/**
 * A chart spec split into its shape (everything vega-lite and vega's parser read) and its holes
 * (the inline data, the title and the description, which they only copy), so charts that differ
 * only in their holes share one compile and one parse (renderSvg.ts). Pure: no vega, no I/O.
 */

/** Own key of the single object standing for a hole's data array in a shape. */
const DATA_MARK = "\u0001data";

/** The text standing for string hole `i` in a shape. */
function sentinel(i: number): string {
  return `\u0001h${i}\u0001`;
}

/** A spec's shape (`key` is its JSON) with what fills its holes: data arrays and strings, by hole index. */
export interface ChartTemplate {
  key: string;
  shape: Record<string, unknown>;
  data: unknown[][];
  strings: string[];
}

/**
 * The template of a Vega-Lite spec, or null when its holes could change what vega-lite or vega
 * makes of the shape: a string hole that is empty or holds a character written differently
 * inside vega's generated code (U+2028, U+2029) or our marker (U+0001), a marker already in the
 * spec, or two inline data arrays alike (vega-lite merges inline sources with equal values).
 * Holes: every `data.values` array (top level and layers), the top-level `description`, and the
 * title's text (a string or each line of an array, so the number of lines stays in the shape).
 * The data arrays are the spec's own (not copies), as vega-lite's compile keeps them.
 * @example chartTemplate(monthlyUsageSpec(chart))?.data.length // 1
 */
export function chartTemplate(spec: Record<string, unknown>): ChartTemplate | null {
  const data: unknown[][] = [];
  const strings: string[] = [];
  const hole = (text: unknown): string | null => {
    if (typeof text !== "string" || !usableText(text)) return null;
    strings.push(text);
    return sentinel(strings.length - 1);
  };
  const shape: Record<string, unknown> = { ...spec };
  if ("description" in spec) {
    const s = hole(spec.description);
    if (s === null) return null;
    shape.description = s;
  }
  if (typeof spec.title === "string") {
    const s = hole(spec.title);
    if (s === null) return null;
    shape.title = s;
  } else if (isPlainObject(spec.title) && "text" in spec.title) {
    const text = spec.title.text;
    const filled = Array.isArray(text) ? text.map(hole) : hole(text);
    if (filled === null || (Array.isArray(filled) && filled.includes(null))) return null;
    shape.title = { ...spec.title, text: filled };
  }
  const withData = (view: Record<string, unknown>): Record<string, unknown> => {
    const d = view.data;
    if (!isPlainObject(d) || !Array.isArray(d.values)) return view;
    data.push(d.values);
    return { ...view, data: { ...d, values: [{ [DATA_MARK]: data.length - 1 }] } };
  };
  Object.assign(shape, withData(shape));
  if (Array.isArray(shape.layer)) shape.layer = shape.layer.map((l) => (isPlainObject(l) ? withData(l) : l));
  if (data.length === 0 || sameData(data)) return null;
  const key = JSON.stringify(shape);
  // Every marker in the key is one of ours: nothing else in the spec may look like one.
  if (countOf(key, "\\u0001") !== 2 * strings.length + data.length) return null;
  return { key, shape, data, strings };
}

/**
 * What filling one compile or parse of a shape needs to know about it, found once
 * (fillPlanOf): the objects it reaches more than once (copied once, and kept shared), its data
 * markers with their hole index, and its strings holding a string hole.
 */
export interface FillPlan {
  readonly value: unknown;
  readonly shared: ReadonlySet<object>;
  readonly marks: ReadonlyMap<object, number>;
  readonly holed: ReadonlySet<string>;
}

/**
 * The fill plan of `value` (a compile or parse of a template's shape with `holes` string holes
 * and `dataHoles` data holes), or null when fillTemplate could not fill it exactly as if the
 * real spec had been compiled or parsed: anything but plain objects, arrays and class instances
 * with plain own fields; a marker that is neither a whole hole nor a string literal in code; a
 * hole dropped or mangled.
 */
export function fillPlanOf(value: unknown, holes: number, dataHoles: number): FillPlan | null {
  const literals = Array.from({ length: holes }, (_, i) => JSON.stringify(sentinel(i)));
  const seenStrings = new Set<number>();
  const seenData = new Set<number>();
  const visited = new Set<object>();
  const shared = new Set<object>();
  const marks = new Map<object, number>();
  const holed = new Set<string>();
  const ok = (v: unknown): boolean => {
    if (typeof v === "string") {
      if (!v.includes("\u0001") && !v.includes("\\u0001")) return true;
      holed.add(v);
      for (let i = 0; i < holes; i++) {
        if (v === sentinel(i)) return seenStrings.add(i), true;
      }
      if (v.includes("\u0001")) return false;
      let rest = v;
      for (let i = 0; i < holes; i++) {
        if (rest.includes(literals[i])) {
          seenStrings.add(i);
          rest = rest.split(literals[i]).join("");
        }
      }
      return !rest.includes("\\u0001");
    }
    if (typeof v === "function" || typeof v === "symbol" || typeof v === "bigint") return false;
    if (typeof v !== "object" || v === null) return true;
    if (visited.has(v)) return shared.add(v), true;
    visited.add(v);
    const mark = dataMark(v);
    if (mark !== null) return mark < dataHoles && (seenData.add(mark), marks.set(v, mark), true);
    if (!Array.isArray(v) && !plainFields(v)) return false;
    if (Object.getOwnPropertySymbols(v).length > 0) return false;
    for (const k of Object.keys(v)) {
      if (k.includes("\u0001")) return false;
      if (!ok((v as Record<string, unknown>)[k])) return false;
    }
    return true;
  };
  return ok(value) && seenStrings.size === holes && seenData.size === dataHoles ? { value, shared, marks, holed } : null;
}

/**
 * The plan's value with the template's holes filled: a copy, shared sub-objects kept shared and
 * prototypes kept, except the data arrays, which are the template's own. A string hole is
 * filled where it stands whole, and inside generated code where vega wrote it as a string literal.
 */
export function fillTemplate(plan: FillPlan, template: ChartTemplate): unknown {
  const literals = template.strings.map((_, i) => JSON.stringify(sentinel(i)));
  const copies = new Map<object, unknown>();
  const { shared, marks, holed } = plan;
  const fill = (v: unknown): unknown => {
    if (typeof v === "string") return holed.has(v) ? fillString(v, template.strings, literals) : v;
    if (typeof v !== "object" || v === null) return v;
    const mark = marks.get(v);
    if (mark !== undefined) return template.data[mark];
    const isShared = shared.has(v);
    if (isShared) {
      const done = copies.get(v);
      if (done !== undefined) return done;
    }
    if (Array.isArray(v)) {
      const out: unknown[] = new Array<unknown>(v.length);
      if (isShared) copies.set(v, out);
      for (let i = 0; i < v.length; i++) out[i] = fill(v[i]);
      return out;
    }
    const proto = Object.getPrototypeOf(v) as object | null;
    const out = (proto === Object.prototype ? {} : Object.create(proto)) as Record<string, unknown>;
    if (isShared) copies.set(v, out);
    for (const k of Object.keys(v)) out[k] = fill((v as Record<string, unknown>)[k]);
    return out;
  };
  return fill(plan.value);
}

/**
 * Whether fillJson can make the JSON of the plan's fills: every object in its value an array, a
 * plain object or an instance of a class with nothing but its constructor (vega-lite's
 * SignalRefWrapper), with no toJSON, so that JSON.stringify writes each value from its own
 * enumerable fields alone, as fillTemplate copies them.
 */
export function jsonFillable(plan: FillPlan): boolean {
  const seen = new Set<object>();
  const plain = (v: unknown): boolean => {
    if (typeof v !== "object" || v === null || seen.has(v)) return true;
    seen.add(v);
    if (plan.marks.has(v)) return true;
    const proto = Object.getPrototypeOf(v) as object | null;
    if (Array.isArray(v) ? proto !== Array.prototype : !bareClass(proto)) return false;
    for (const [k, d] of Object.entries(Object.getOwnPropertyDescriptors(v))) {
      if (k === "toJSON") return false;
      // A getter (SignalRefWrapper's `signal`) is read as fillTemplate and JSON.stringify read it.
      if (d.enumerable && !plain("value" in d ? d.value : (v as Record<string, unknown>)[k])) return false;
    }
    return true;
  };
  return plain(plan.value);
}

/** Object.prototype, or the prototype of a class that adds nothing but its constructor to it. */
function bareClass(proto: object | null): boolean {
  if (proto === Object.prototype) return true;
  if (proto === null || Object.getPrototypeOf(proto) !== Object.prototype) return false;
  const own = Reflect.ownKeys(proto);
  return own.length === 1 && own[0] === "constructor";
}

/** A data marker, a whole string hole, and a string hole's literal inside a string (generated code), as JSON.stringify writes them. */
const HOLE_JSON = /\[\{"\\u0001data":(\d+)\}\]|"\\u0001h(\d+)\\u0001"|\\"\\\\u0001h(\d+)\\\\u0001\\"/g;

/**
 * JSON.stringify(fillTemplate(plan, template)) made from `json`, the JSON of a plan's value
 * (jsonFillable), without the copy: JSON text is written value by value, so each hole's text
 * is replaced by its fill's. A data marker becomes its data's JSON, a whole string hole its
 * string's, and a hole's string literal inside a string (code vega generated) the JSON of the
 * literal of its string, as fillString writes it there.
 * @example fillJson(JSON.stringify(plan.value), template) === JSON.stringify(fillTemplate(plan, template)) // true
 */
export function fillJson(json: string, template: ChartTemplate): string {
  return json.replace(HOLE_JSON, (_m, data: string | undefined, whole: string | undefined, literal: string | undefined) => {
    if (data !== undefined) return JSON.stringify(template.data[Number(data)]);
    if (whole !== undefined) return JSON.stringify(template.strings[Number(whole)]);
    return JSON.stringify(JSON.stringify(template.strings[Number(literal)])).slice(1, -1);
  });
}

/** A plain object, or an instance of a class of plain fields (vega's parser writes its operators as such). */
function plainFields(v: object): boolean {
  const proto = Object.getPrototypeOf(v) as object | null;
  if (proto === null || proto === Object.prototype) return true;
  return Object.getPrototypeOf(proto) === Object.prototype && !(v instanceof Date) && !(v instanceof RegExp) && !(v instanceof Map) && !(v instanceof Set) && !ArrayBuffer.isView(v);
}

function fillString(v: string, strings: readonly string[], literals: readonly string[]): string {
  if (!v.includes("\u0001") && !v.includes("\\u0001")) return v;
  for (let i = 0; i < strings.length; i++) if (v === sentinel(i)) return strings[i];
  let out = v;
  // vega writes a constant string into generated code as JSON.stringify does (vega-util
  // stringValue; it differs only for U+2028 and U+2029, which chartTemplate refuses).
  for (let i = 0; i < literals.length; i++) if (out.includes(literals[i])) out = out.split(literals[i]).join(JSON.stringify(strings[i]));
  return out;
}

/** The hole index of a data marker (`[{ "\u0001data": i }]`), or null. */
function dataMark(v: object): number | null {
  if (!Array.isArray(v) || v.length !== 1) return null;
  const first: unknown = v[0];
  if (!isPlainObject(first)) return null;
  const keys = Object.keys(first);
  return keys.length === 1 && keys[0] === DATA_MARK && typeof first[DATA_MARK] === "number" ? first[DATA_MARK] : null;
}

function usableText(text: string): boolean {
  return text !== "" && !/[\u0001\u2028\u2029]/.test(text) && !text.includes("\\u0001");
}

function sameData(data: readonly unknown[][]): boolean {
  if (data.length < 2) return false;
  const seen = new Set<string>();
  for (const d of data) {
    const json = JSON.stringify(d);
    if (seen.has(json)) return true;
    seen.add(json);
  }
  return false;
}

function countOf(text: string, part: string): number {
  return text.split(part).length - 1;
}

function isPlainObject(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}
