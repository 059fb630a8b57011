// Interactive charts: each server-rendered figure carries its spec, compiled to Vega on the
// server, as JSON; replace the static SVG with a live vega view. Only the vega runtime is
// shipped (no vega-lite, no vega-embed). `ast: true` + vega-interpreter evaluate expressions
// without generating code, so the pages work under a Content-Security-Policy without
// 'unsafe-eval'.
import { View, parse } from "vega";
import { expressionInterpreter } from "vega-interpreter";

let tooltipNode = null;


/** The one tooltip element of the page, created on first use. */
function tooltipElement() {
  if (!tooltipNode) {
    tooltipNode = document.createElement("div");
    tooltipNode.id = "chart-tooltip";
    tooltipNode.setAttribute("role", "tooltip");
    tooltipNode.hidden = true;
    document.body.append(tooltipNode);
  }
  return tooltipNode;
}

/**
 * vega tooltip handler (view.tooltip API): `value` is the item's tooltip — an object of
 * title → formatted value for Vega-Lite tooltips, or a plain value. Shown next to the pointer,
 * built with text nodes only (values are user text).
 */
function showTooltip(_handler, event, _item, value) {
  const el = tooltipElement();
  if (value == null || value === "") {
    el.hidden = true;
    return;
  }
  el.replaceChildren();
  if (typeof value === "object") {
    const table = document.createElement("table");
    for (const [key, v] of Object.entries(value)) {
      const tr = table.insertRow();
      const th = document.createElement("th");
      th.scope = "row";
      th.textContent = String(key);
      const td = tr.insertCell();
      td.textContent = String(v);
      tr.prepend(th);
    }
    el.append(table);
  } else {
    el.textContent = String(value);
  }
  el.hidden = false;
  const pad = 12;
  const x = event.clientX + pad;
  const y = event.clientY + pad;
  const box = el.getBoundingClientRect();
  el.style.left = `${Math.min(x, window.innerWidth - box.width - pad) + window.scrollX}px`;
  el.style.top = `${(y + box.height > window.innerHeight ? event.clientY - box.height - pad : y) + window.scrollY}px`;
}

async function enhance(figure) {
  const specNode = figure.querySelector("script.chart-spec");
  const fallback = figure.querySelector(".chart-fallback");
  if (!specNode || !fallback) return;
  const spec = JSON.parse(specNode.textContent);
  const target = document.createElement("div");
  target.className = "chart-live";
  fallback.after(target);
  try {
    const view = new View(parse(spec, null, { ast: true }), {
      expr: expressionInterpreter,
      // SVG unless the spec asks for a canvas (the ~9,000-cell heatmap).
      renderer: spec.usermeta?.renderer === "canvas" ? "canvas" : "svg",
      container: target,
      hover: true,
    });
    view.tooltip(showTooltip);
    await view.runAsync();
    const drawn = target.querySelector("svg, canvas");
    if (drawn) {
      drawn.setAttribute("role", "img");
      drawn.setAttribute("aria-label", spec.description || figure.querySelector("figcaption")?.textContent || "Chart");
    }
    fallback.hidden = true;
    figure.dataset.chartState = "interactive";
    figure.vegaView = view;
  } catch (error) {
    // Keep the static SVG; the page stays complete.
    target.remove();
    figure.dataset.chartState = "static";
    console.warn("chart stayed static:", error);
  }
}

/** Replaces each figure[data-chart]'s SVG fallback under `root` with an interactive view. */
export function enhanceCharts(root) {
  document.addEventListener("keydown", (e) => {
    if (e.key === "Escape" && tooltipNode) tooltipNode.hidden = true;
  });
  return Promise.all(Array.from(root.querySelectorAll("figure[data-chart]")).map(enhance));
}
