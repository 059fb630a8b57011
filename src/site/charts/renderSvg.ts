/**
 * Server-side SVG of a Vega-Lite spec, for pages read without JavaScript.
 * vega-lite compile → vega parse → headless View (renderer "none") → toSVG.
 * Charts that differ only in their data, title and description (chartTemplate.ts) share one
 * compile and one parse: a site's charts come in a few dozen such shapes, and the compile and
 * parse were about half the cost of a chart.
 */
import { serverVegaSpec } from "./serverSpec.ts";
import { keptExpressions, type ExpressionCodegen } from "./vegaExpressions.ts";
import { chartTemplate, fillJson, fillPlanOf, fillTemplate, jsonFillable, type ChartTemplate, type FillPlan } from "./chartTemplate.ts";
import { jsonForScript, scriptSafeJson } from "../../report/index.ts";

type VegaModule = typeof import("vega");
type VegaLiteModule = typeof import("vega-lite");

let libs: Promise<{ vega: VegaModule; vl: VegaLiteModule; expr: ExpressionCodegen }> | null = null;

/** Loads vega and vega-lite once per process (≈0.5 s); later charts reuse them, and the expressions compiled for earlier charts (vegaExpressions.ts). */
function loadLibs(): Promise<{ vega: VegaModule; vl: VegaLiteModule; expr: ExpressionCodegen }> {
  libs ??= Promise.all([import("vega"), import("vega-lite")]).then(([vega, vl]) => ({ vega, vl, expr: keptExpressions(vega) }));
  return libs;
}

/** Width used when a spec asks for `width: "container"` (no container exists on the server). */
export const SERVER_WIDTH_PX = 720;

function escapeXml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

/**
 * Compiles a Vega-Lite spec to a Vega spec, so the browser needs only the vega runtime (not
 * vega-lite). `width: "container"` is kept: the compiled spec sizes itself to its container.
 * @throws when the spec does not compile.
 * @example (await compileToVega(monthlyUsageSpec(chart))).marks.length > 0 // true
 */
export async function compileToVega(spec: Record<string, unknown>): Promise<Record<string, unknown>> {
  const { vl } = await loadLibs();
  const template = chartTemplate(spec);
  const shape = template ? shapeOf(vl, template) : null;
  if (template && shape?.compiled) return fillTemplate(shape.compiled, template) as Record<string, unknown>;
  return vl.compile(spec as never).spec as unknown as Record<string, unknown>;
}

/**
 * compileToVega(spec) as a page carries it (jsonForScript), with the compile itself made only
 * when `compiled` is called: a chart of a known shape has its JSON written from its shape's
 * (fillJson), without a copy of the compile. Give `compiled` to renderSvg.
 * @throws when the spec does not compile.
 * @example (await compileToVegaJson(spec)).json === jsonForScript(await compileToVega(spec)) // true
 */
export async function compileToVegaJson(spec: Record<string, unknown>): Promise<{ json: string; compiled: () => Record<string, unknown> }> {
  const { vl } = await loadLibs();
  const template = chartTemplate(spec);
  const shape = template ? shapeOf(vl, template) : null;
  if (template && shape?.compiled) {
    const plan = shape.compiled;
    if (shape.json === undefined) shape.json = jsonFillable(plan) ? JSON.stringify(plan.value) : null;
    const compiled = () => fillTemplate(plan, template) as Record<string, unknown>;
    return { json: shape.json === null ? jsonForScript(compiled()) : scriptSafeJson(fillJson(shape.json, template)), compiled };
  }
  const vega = vl.compile(spec as never).spec as unknown as Record<string, unknown>;
  return { json: jsonForScript(vega), compiled: () => vega };
}

/**
 * What vega-lite and vega's parser made of one shape of chart (chartTemplate.ts): its compile
 * and the parse of its server spec, each null when it cannot be filled exactly (the chart is
 * then compiled or parsed as it is), the parse made on first use.
 */
interface Shape {
  spec: Record<string, unknown>;
  compiled: FillPlan | null;
  runtime?: FillPlan | null;
  /** JSON of the compile's plan (null: it is not jsonFillable), made on first use. */
  json?: string | null;
}

/**
 * Shapes seen, by key, least recently used first. Most of a site's charts come in a few dozen
 * shapes; the rest (a heatmap's colour scale, a scatter's legend) are one-offs that pass
 * through. A shape keeps about 200 KB (its compile and parse), so at most this many are kept.
 */
const MAX_SHAPES = 64;
const shapes = new Map<string, Shape>();
function shapeOf(vl: VegaLiteModule, template: ChartTemplate): Shape {
  let shape = shapes.get(template.key);
  if (shape) {
    shapes.delete(template.key);
    shapes.set(template.key, shape);
    return shape;
  }
  const compiled = vl.compile(template.shape as never).spec as unknown as Record<string, unknown>;
  shape = { spec: template.shape, compiled: fillPlanOf(compiled, template.strings.length, template.data.length) };
  if (shapes.size >= MAX_SHAPES) shapes.delete(shapes.keys().next().value!);
  shapes.set(template.key, shape);
  return shape;
}

/**
 * vega's parse of the server spec of `spec` (whose compile by compileToVega is `compiled`): its
 * shape's parse with the holes filled, or parsed as it is when the shape's cannot be filled.
 */
function runtimeOf(vega: VegaModule, vl: VegaLiteModule, spec: Record<string, unknown>, compiled: Compiled | undefined): unknown {
  const template = chartTemplate(spec);
  const shape = template ? shapeOf(vl, template) : null;
  if (template && shape?.compiled) {
    if (shape.runtime === undefined) {
      const runtime = vega.parse(serverVega(vl, shape.spec, shape.compiled.value as Record<string, unknown>) as never);
      shape.runtime = fillPlanOf(runtime, template.strings.length, template.data.length);
    }
    if (shape.runtime !== null) return fillTemplate(shape.runtime, template);
  }
  return vega.parse(serverVega(vl, spec, typeof compiled === "function" ? compiled() : compiled) as never);
}

/** A spec's compile by compileToVega, or the function compileToVegaJson gives that makes it. */
type Compiled = Record<string, unknown> | (() => Record<string, unknown>);

/**
 * Renders a Vega-Lite spec to an accessible SVG string: `role="img"`, `aria-label` and a
 * `<title>` taken from `label` (falling back to the spec's description or title). Given
 * `compiled`, the spec's compile by compileToVega (or compileToVegaJson's `compiled`), the
 * server's Vega spec is made from it (serverSpec.ts) instead of compiling the spec a second
 * time, when it can be.
 * @throws when the spec does not compile (a programming error in a spec builder).
 * @example await renderSvg(monthlyUsageSpec(chart), "Electricity use by month") // "<svg …"
 */
export async function renderSvg(spec: Record<string, unknown>, label?: string, compiled?: Compiled): Promise<string> {
  const { vega, vl, expr } = await loadLibs();
  const view = new vega.View(runtimeOf(vega, vl, spec, compiled) as never, { renderer: "none", expr } as never);
  try {
    return accessibleSvg(await view.toSVG(), spec, label);
  } finally {
    view.finalize();
  }
}

/**
 * Vega's SVG of `spec` with its accessible name: `role="img"`, `aria-label` and a `<title>`
 * from `label` (falling back to the spec's description or title).
 * @example accessibleSvg('<svg class="marks">…', spec, "Use") // '<svg class="marks" role="img" aria-label="Use"><title>Use</title>…'
 */
export function accessibleSvg(svg: string, spec: Record<string, unknown>, label?: string): string {
  const text = label ?? String(spec.description ?? spec.title ?? "Chart");
  const safe = escapeXml(text);
  // Vega writes its own root <svg ...>; add the accessible name and a <title> right inside it.
  return svg.replace(/^<svg\b([^>]*)>/, (_m, attrs: string) => {
    const cleaned = attrs.replace(/\s(role|aria-label)="[^"]*"/g, "");
    return `<svg${cleaned} role="img" aria-label="${safe}"><title>${safe}</title>`;
  });
}

/** The Vega spec rendered on the server: `width: "container"` becomes SERVER_WIDTH_PX (no container exists here). */
function serverVega(vl: VegaLiteModule, spec: Record<string, unknown>, compiled: Record<string, unknown> | undefined): unknown {
  if (compiled && spec.width !== "container") return compiled;
  const derived = compiled ? serverVegaSpec(spec, compiled, SERVER_WIDTH_PX) : null;
  if (derived) return derived;
  const serverSpec = { ...spec };
  if (serverSpec.width === "container") serverSpec.width = SERVER_WIDTH_PX;
  return vl.compile(serverSpec as never).spec;
}
