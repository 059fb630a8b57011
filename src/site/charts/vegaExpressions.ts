/**
 * vega's expression code generator with its functions kept between views: each headless View
 * otherwise compiles every expression of its chart again (`Function(...)` per expression, with
 * a fresh compile by V8), though charts of one shape share nearly all of them.
 *
 * vega-runtime makes each function from the expression's code alone and binds it to the view's
 * function context (vega-runtime's `expression`: `Function(...args, code)`, then
 * `fn.bind(ctx.functions)`). Here the unbound function is made once per code and bound afresh
 * for each view, so every view still gets a function object of its own (vega sets fields on
 * it) that runs the same code with the same `this`. The code generators for field accessors and
 * comparators (`codegen`) are vega's own, unchanged: vega names those function objects.
 */

/** The code generator a vega View takes as its `expr` option (vega-runtime's expressionCodegen). */
export interface ExpressionCodegen {
  operator(ctx: ExpressionContext, expr: { code: string }): unknown;
  parameter(ctx: ExpressionContext, expr: { code: string }): unknown;
  event(ctx: ExpressionContext, expr: { code: string }): unknown;
  handler(ctx: ExpressionContext, expr: { code: string }): unknown;
  encode(ctx: ExpressionContext, encode: { marktype: string; channels: Record<string, { code: string }> }): unknown;
  codegen: unknown;
}

interface ExpressionContext {
  functions?: object;
}

/** The part of the vega module used here: vega-runtime's context, re-exported by vega. */
interface VegaRuntime {
  runtimeContext(df: { events(): void }, transforms: object, functions: null): { expr: ExpressionCodegen };
}

/**
 * Functions kept (by kind and code). Charts of a site share a few hundred; each chart adds one
 * or two of its own (its title's text is in its code), so past this many all go and the shared
 * ones are made again, once.
 */
const MAX_FUNCTIONS = 1000;

/**
 * vega's default code generator (the one a View uses without `expr`), with the functions it makes
 * for operators, parameters, events, handlers and encoders kept by code.
 * @example new vega.View(runtime, { renderer: "none", expr: keptExpressions(vega) })
 */
export function keptExpressions(vega: unknown): ExpressionCodegen {
  const base = (vega as VegaRuntime).runtimeContext({ events() {} }, {}, null).expr;
  const made = new Map<string, (...args: unknown[]) => unknown>();
  // Without function context vega's generator returns the function unbound.
  const bare: ExpressionContext = {};
  const kept = (ctx: ExpressionContext, key: string, make: () => unknown): unknown => {
    let fn = made.get(key);
    if (fn === undefined) {
      fn = make() as (...args: unknown[]) => unknown;
      if (made.size >= MAX_FUNCTIONS) made.clear();
      made.set(key, fn);
    }
    // As vega-runtime's `expression` binds it.
    return ctx && ctx.functions ? fn.bind(ctx.functions) : fn;
  };
  return {
    ...base,
    operator: (ctx, expr) => kept(ctx, `o\u0000${expr.code}`, () => base.operator(bare, expr)),
    parameter: (ctx, expr) => kept(ctx, `p\u0000${expr.code}`, () => base.parameter(bare, expr)),
    event: (ctx, expr) => kept(ctx, `e\u0000${expr.code}`, () => base.event(bare, expr)),
    handler: (ctx, expr) => kept(ctx, `h\u0000${expr.code}`, () => base.handler(bare, expr)),
    encode: (ctx, encode) => kept(ctx, encodeKey(encode), () => base.encode(bare, encode)),
  };
}

/**
 * What vega's encoder code is made from: the mark type and each channel's name and code, in the
 * order vega reads them (for…in).
 */
function encodeKey(encode: { marktype: string; channels: Record<string, { code: string }> }): string {
  let key = `n\u0000${encode.marktype}`;
  for (const name in encode.channels) key += `\u0000${name}\u0000${encode.channels[name].code}`;
  return key;
}
