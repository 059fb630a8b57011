/**
 * Server-side SVG of a Vega-Lite spec, for pages read without JavaScript.
 * vega-lite compile → vega parse → headless View (renderer "none") → toSVG.
 */
import { serverVegaSpec } from "./serverSpec.ts";

type VegaModule = typeof import("vega");
type VegaLiteModule = typeof import("vega-lite");

let libs: Promise<{ vega: VegaModule; vl: VegaLiteModule }> | null = null;

/** Loads vega and vega-lite once per process (≈0.5 s); later charts reuse them. */
function loadLibs(): Promise<{ vega: VegaModule; vl: VegaLiteModule }> {
  libs ??= Promise.all([import("vega"), import("vega-lite")]).then(([vega, vl]) => ({ vega, vl }));
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
  return vl.compile(spec as never).spec as unknown as Record<string, unknown>;
}

/**
 * Renders a Vega-Lite spec to an accessible SVG string: `role="img"`, `aria-label` and a
 * `<title>` taken from `label` (falling back to the spec's description or title). Given
 * `compiled`, the spec's compile by compileToVega, the server's Vega spec is made from it
 * (serverSpec.ts) instead of compiling the spec a second time, when it can be.
 * @throws when the spec does not compile (a programming error in a spec builder).
 * @example await renderSvg(monthlyUsageSpec(chart), "Electricity use by month") // "<svg …"
 */
export async function renderSvg(spec: Record<string, unknown>, label?: string, compiled?: Record<string, unknown>): Promise<string> {
  const { vega, vl } = await loadLibs();
  const view = new vega.View(vega.parse(serverVega(vl, spec, compiled) as never), { renderer: "none" });
  try {
    const svg = await view.toSVG();
    const text = label ?? String(spec.description ?? spec.title ?? "Chart");
    const safe = escapeXml(text);
    // Vega writes its own root <svg ...>; add the accessible name and a <title> right inside it.
    return svg.replace(/^<svg\b([^>]*)>/, (_m, attrs: string) => {
      const cleaned = attrs.replace(/\s(role|aria-label)="[^"]*"/g, "");
      return `<svg${cleaned} role="img" aria-label="${safe}"><title>${safe}</title>`;
    });
  } finally {
    view.finalize();
  }
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
