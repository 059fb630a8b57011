/**
 * Compact server SVG of the day × hour heatmap. Vega's SVG renderer writes one element per
 * cell (≈ 9,000 for a year, close to 1 MB); here cells of one colour band share one path of
 * short relative moves, so a year is a few tens of kilobytes before compression.
 */
import type { HeatmapChartModel } from "../../report/index.ts";
import { FLAG_COLOR, FONT_STACK, HEAT_RANGE, INK, MUTED_INK } from "./palette.ts";

function escapeXml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];
const fmt = (v: number) => String(Math.round(v * 100) / 100);

/**
 * SVG of a heatmap chart model: colour bands are equal-width bins of 0 … colorMax (values above
 * it fall in the top band), colours HEAT_RANGE; flagged hours are overlaid in FLAG_COLOR; months labelled along the bottom.
 * @example heatmapSvg(chart).startsWith("<svg") // true
 */
export function heatmapSvg(chart: HeatmapChartModel, widthPx = 720): string {
  const left = 44;
  const top = 28;
  const cellH = 8;
  const plotW = widthPx - left - 12;
  const n = Math.max(1, chart.days.length);
  const cellW = plotW / n;
  const plotH = 24 * cellH;
  // Same colour domain as the live chart: 0 … colorMax, higher values clamped to the top band.
  const min = 0;
  const max = chart.colorMax > 0 ? chart.colorMax : 1;
  const bins = HEAT_RANGE.length;
  const span = max - min || 1;
  const paths: string[][] = Array.from({ length: bins }, () => []);
  const flagged: string[] = [];
  const w = fmt(cellW);
  const binOf = (v: number | null) => (v == null ? -1 : Math.max(0, Math.min(bins - 1, Math.floor(((v - min) / span) * bins))));
  chart.days.forEach((d, i) => {
    const x = fmt(left + i * cellW);
    // Consecutive hours of one day in the same band become one rectangle.
    let h = 0;
    while (h < 24) {
      const bin = binOf(d.values[h]);
      let end = h + 1;
      while (end < 24 && binOf(d.values[end]) === bin) end++;
      if (bin >= 0) paths[bin].push(`M${x} ${top + h * cellH}h${w}v${(end - h) * cellH}h-${w}z`);
      h = end;
    }
    h = 0;
    while (h < 24) {
      if (d.flagged[h] !== 1) {
        h++;
        continue;
      }
      let end = h + 1;
      while (end < 24 && d.flagged[end] === 1) end++;
      flagged.push(`M${x} ${top + h * cellH}h${w}v${(end - h) * cellH}h-${w}z`);
      h = end;
    }
  });
  const label = escapeXml(chart.description);
  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${widthPx}" height="${top + plotH + 70}" viewBox="0 0 ${widthPx} ${top + plotH + 70}" role="img" aria-label="${label}" font-family='${FONT_STACK}'><title>${label}</title>`);
  parts.push(`<rect width="100%" height="100%" fill="#ffffff"/>`);
  parts.push(`<text x="0" y="16" font-size="14" font-weight="600" fill="${INK}">${escapeXml(chart.title)}</text>`);
  paths.forEach((p, b) => p.length && parts.push(`<path fill="${HEAT_RANGE[b]}" d="${p.join("")}"/>`));
  if (flagged.length) parts.push(`<path fill="${FLAG_COLOR}" d="${flagged.join("")}"/>`);
  for (const h of [0, 6, 12, 18]) parts.push(`<text x="${left - 6}" y="${top + h * cellH + cellH - 1}" font-size="10" text-anchor="end" fill="${MUTED_INK}">${h}</text>`);
  parts.push(`<text x="10" y="${top + plotH / 2}" font-size="11" fill="${INK}" transform="rotate(-90 10 ${top + plotH / 2})" text-anchor="middle">Hour (local)</text>`);
  chart.days.forEach((d, i) => {
    if (d.day.endsWith("-01") || i === 0) {
      const month = MONTHS[Number(d.day.slice(5, 7)) - 1];
      parts.push(`<text x="${fmt(left + i * cellW)}" y="${top + plotH + 14}" font-size="10" fill="${MUTED_INK}">${month} ${d.day.slice(2, 4)}</text>`);
    }
  });
  const ly = top + plotH + 34;
  parts.push(`<text x="${left}" y="${ly + 10}" font-size="11" fill="${INK}">${escapeXml(chart.valueLabel)}: ${fmt(min)}</text>`);
  HEAT_RANGE.forEach((c, b) => parts.push(`<rect x="${left + 150 + b * 18}" y="${ly}" width="18" height="12" fill="${c}"/>`));
  parts.push(`<text x="${left + 150 + bins * 18 + 6}" y="${ly + 10}" font-size="11" fill="${INK}">${fmt(max)} or more</text>`);
  parts.push(`<rect x="${left + 300}" y="${ly}" width="12" height="12" fill="${FLAG_COLOR}"/><text x="${left + 318}" y="${ly + 10}" font-size="11" fill="${INK}">flagged hour</text>`);
  parts.push("</svg>");
  return parts.join("");
}
