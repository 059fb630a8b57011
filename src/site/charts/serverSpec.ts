/**
 * The server's Vega spec (a fixed width) derived from the browser's (`width: "container"`), so
 * each chart is compiled by vega-lite once, not twice. Pure: no vega, no I/O.
 */

/** The width signal vega-lite 6 writes for `width: "container"` (src/compile/layoutsize/assemble.ts). */
function isContainerWidthSignal(signal: unknown): boolean {
  if (typeof signal !== "object" || signal === null) return false;
  const s = signal as Record<string, unknown>;
  const init = s.init;
  if (s.name !== "width" || typeof init !== "string" || !/^isFinite\(containerSize\(\)\[0\]\) \? containerSize\(\)\[0\] : \d+(\.\d+)?$/.test(init)) return false;
  const on = s.on;
  return Object.keys(s).length === 3 && Array.isArray(on) && on.length === 1 && JSON.stringify(on[0]) === JSON.stringify({ update: init, events: "window:resize" });
}

/**
 * The Vega spec vega-lite would compile from `spec` with `width: widthPx` instead of
 * `width: "container"`, made from `browser` (the compile of `spec` as is), or null when this
 * derivation does not know the spec's shape (the caller then compiles again).
 *
 * vega-lite compiles the two widths alike except for the width itself: "container" becomes a
 * top-level `signals: [width signal]`, a number becomes a top-level `width` key written just
 * before `height` (both come from the layout signals, width first). Only that case is derived:
 * a single or layered view (fit-compatible), its own autosize giving both `type` and `contains`
 * (else vega-lite's container default "fit-x"/"padding" would differ from the number's "pad"),
 * a fixed height and no other signal. Sub-objects are shared with `browser`, not copied.
 * Checked against vega-lite's own compile for every chart kind in test/site/serverSpec.test.ts.
 * @example serverVegaSpec({ width: "container", height: 240, autosize: { type: "fit-x", contains: "padding" }, … }, compiled, 720)?.width // 720
 */
export function serverVegaSpec(spec: Record<string, unknown>, browser: Record<string, unknown>, widthPx: number): Record<string, unknown> | null {
  if (spec.width !== "container") return null;
  if (!("mark" in spec) && !("layer" in spec)) return null;
  const autosize = spec.autosize;
  if (typeof autosize !== "object" || autosize === null || !("type" in autosize) || !("contains" in autosize)) return null;
  if ("width" in browser || typeof browser.height !== "number") return null;
  const signals = browser.signals;
  if (!Array.isArray(signals) || signals.length !== 1 || !isContainerWidthSignal(signals[0])) return null;
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(browser)) {
    if (key === "signals") continue;
    if (key === "height") out.width = widthPx;
    out[key] = value;
  }
  return out;
}
