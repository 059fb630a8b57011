/**
 * ohmbook's own chart look: calm, legible colours with enough contrast on white, and the
 * system font stack (no web fonts from other hosts). Shared by the spec builders.
 */
export const FONT_STACK =
  'system-ui, -apple-system, "Segoe UI", Roboto, "Noto Sans", "Liberation Sans", Arial, sans-serif';

/** Series colours: deep teal, ochre, slate blue, moss, brick, plum (each ≥ 3:1 on white). */
export const SERIES_COLORS = ["#1f6f78", "#a5671a", "#4a5d9c", "#5b7a2e", "#a23e2f", "#7a4a7f"] as const;

export const INK = "#1d2a30";
export const MUTED_INK = "#4f5d63";
export const GRID = "#e3e8ea";

/** Vega-Lite `config` block applying the palette and typography. */
export function chartConfig(): Record<string, unknown> {
  return {
    font: FONT_STACK,
    background: "#ffffff",
    view: { stroke: null },
    range: { category: [...SERIES_COLORS] },
    axis: {
      labelColor: MUTED_INK,
      titleColor: INK,
      gridColor: GRID,
      domainColor: MUTED_INK,
      tickColor: MUTED_INK,
      labelFontSize: 11,
      titleFontSize: 12,
      titleFontWeight: 600,
    },
    // Legend labels are never cut short (limit 0 = none), and symbol legends list one entry per
    // line so a legend under a narrow chart never runs past its right edge.
    legend: { labelColor: INK, titleColor: INK, labelFontSize: 11, titleFontSize: 12, orient: "bottom", labelLimit: 0, direction: "vertical" },
    title: { color: INK, fontSize: 14, fontWeight: 600, anchor: "start" },
  };
}

/** Sequential range of the heatmap, pale to deep teal (our own, not a named scheme). */
export const HEAT_RANGE = ["#eef5f4", "#a9d0cb", "#4f9a98", "#1f6f78", "#123f47"] as const;
/** Marks flagged data: strong orange, distinct from the teal ramp. */
export const FLAG_COLOR = "#e0701a";
