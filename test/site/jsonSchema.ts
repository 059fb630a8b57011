/**
 * A minimal JSON Schema (draft-07 subset) validator, enough for the keywords the Vega-Lite
 * schema uses: $ref (local), type, enum, const, properties, required, additionalProperties,
 * items, anyOf, min/max Items/Length/Properties, minimum/maximum. `format` is ignored.
 * Test helper only; no JSON Schema library is installed in this project.
 */
type Schema = boolean | { [k: string]: unknown };

export interface SchemaError {
  path: string;
  message: string;
}

function typeOf(v: unknown): string {
  if (v === null) return "null";
  if (Array.isArray(v)) return "array";
  if (typeof v === "number") return Number.isInteger(v) ? "integer" : "number";
  return typeof v;
}

function typeMatches(want: string, got: string): boolean {
  return want === got || (want === "number" && got === "integer");
}

/** Returns the errors of `value` against `schema` (empty = valid); `root` resolves `#/definitions/...`. */
export function validate(value: unknown, schema: Schema, root: Record<string, unknown>, path = "$"): SchemaError[] {
  if (schema === true) return [];
  if (schema === false) return [{ path, message: "no value allowed here" }];
  const s = schema as Record<string, unknown>;
  if (typeof s.$ref === "string") {
    const ref = s.$ref;
    if (!ref.startsWith("#/")) return [{ path, message: `unsupported $ref ${ref}` }];
    let target: unknown = root;
    for (const part of ref.slice(2).split("/")) target = (target as Record<string, unknown>)[decodeURIComponent(part.replace(/~1/g, "/").replace(/~0/g, "~"))];
    if (target === undefined) return [{ path, message: `unresolved $ref ${ref}` }];
    return validate(value, target as Schema, root, path);
  }
  const errors: SchemaError[] = [];
  const t = typeOf(value);
  if (s.type !== undefined) {
    const types = Array.isArray(s.type) ? (s.type as string[]) : [s.type as string];
    if (!types.some((w) => typeMatches(w, t))) return [{ path, message: `expected ${types.join("|")}, got ${t}` }];
  }
  if (s.enum && !(s.enum as unknown[]).some((e) => JSON.stringify(e) === JSON.stringify(value))) {
    errors.push({ path, message: `not one of ${JSON.stringify(s.enum).slice(0, 120)}` });
  }
  if ("const" in s && JSON.stringify(s.const) !== JSON.stringify(value)) errors.push({ path, message: `expected ${JSON.stringify(s.const)}` });
  if (t === "number" || t === "integer") {
    if (typeof s.minimum === "number" && (value as number) < s.minimum) errors.push({ path, message: `below minimum ${s.minimum}` });
    if (typeof s.maximum === "number" && (value as number) > s.maximum) errors.push({ path, message: `above maximum ${s.maximum}` });
  }
  if (t === "string") {
    const len = [...(value as string)].length;
    if (typeof s.minLength === "number" && len < s.minLength) errors.push({ path, message: "too short" });
    if (typeof s.maxLength === "number" && len > s.maxLength) errors.push({ path, message: "too long" });
  }
  if (t === "array") {
    const arr = value as unknown[];
    if (typeof s.minItems === "number" && arr.length < s.minItems) errors.push({ path, message: "too few items" });
    if (typeof s.maxItems === "number" && arr.length > s.maxItems) errors.push({ path, message: "too many items" });
    if (Array.isArray(s.items)) {
      (s.items as Schema[]).forEach((is, i) => i < arr.length && errors.push(...validate(arr[i], is, root, `${path}[${i}]`)));
    } else if (s.items !== undefined) {
      arr.forEach((v, i) => errors.push(...validate(v, s.items as Schema, root, `${path}[${i}]`)));
    }
  }
  if (t === "object") {
    const obj = value as Record<string, unknown>;
    const props = (s.properties ?? {}) as Record<string, Schema>;
    for (const r of (s.required ?? []) as string[]) if (!(r in obj)) errors.push({ path, message: `missing required ${r}` });
    if (typeof s.minProperties === "number" && Object.keys(obj).length < s.minProperties) errors.push({ path, message: "too few properties" });
    for (const [k, v] of Object.entries(obj)) {
      if (k in props) errors.push(...validate(v, props[k], root, `${path}.${k}`));
      else if (s.additionalProperties === false) errors.push({ path, message: `unknown property ${k}` });
      else if (s.additionalProperties !== undefined && s.additionalProperties !== true) {
        errors.push(...validate(v, s.additionalProperties as Schema, root, `${path}.${k}`));
      }
    }
  }
  if (Array.isArray(s.anyOf)) {
    const branches = (s.anyOf as Schema[]).map((b) => validate(value, b, root, path));
    if (!branches.some((b) => b.length === 0)) {
      // Report the branch that got furthest (fewest errors) so messages stay useful.
      const best = branches.reduce((a, b) => (b.length < a.length ? b : a));
      errors.push({ path, message: "matches no allowed form" }, ...best);
    }
  }
  return errors;
}
