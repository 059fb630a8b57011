// Interactive charts: each server-rendered figure carries its Vega-Lite spec as JSON; replace
// the static SVG with a live vega view (tooltips on, export menu off). `ast: true` makes vega
// evaluate expressions with its interpreter instead of generating code with `new Function`,
// so the pages work under a Content-Security-Policy without 'unsafe-eval'.
import embed from "vega-embed";

async function enhance(figure) {
  const specNode = figure.querySelector("script.chart-spec");
  const fallback = figure.querySelector(".chart-fallback");
  if (!specNode || !fallback) return;
  const spec = JSON.parse(specNode.textContent);
  const target = document.createElement("div");
  target.className = "chart-live";
  fallback.after(target);
  try {
    const result = await embed(target, spec, { actions: false, ast: true, renderer: "svg", tooltip: true });
    const svg = target.querySelector("svg");
    if (svg) {
      svg.setAttribute("role", "img");
      svg.setAttribute("aria-label", spec.description || spec.title || "Chart");
    }
    fallback.hidden = true;
    figure.dataset.chartState = "interactive";
    figure.vegaView = result.view;
  } catch (error) {
    // Keep the static SVG; the page stays complete.
    target.remove();
    figure.dataset.chartState = "static";
    console.warn("chart stayed static:", error);
  }
}

/** Replaces each figure[data-chart]'s SVG fallback under `root` with an interactive view. */
export function enhanceCharts(root) {
  return Promise.all(Array.from(root.querySelectorAll("figure[data-chart]")).map(enhance));
}
