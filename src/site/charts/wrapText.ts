/** Line wrapping for chart text, so titles and labels are broken onto lines instead of cut short. */

/**
 * Splits a text into lines of at most `max` characters at spaces (a longer word stays whole).
 * @example wrapLabel("Billed usage differs from the interval meter", 22) // ["Billed usage differs", "from the interval", "meter"]
 */
export function wrapLabel(text: string, max: number): string[] {
  const lines: string[] = [];
  for (const word of text.split(/\s+/u).filter(Boolean)) {
    const last = lines.length - 1;
    if (last >= 0 && lines[last].length + 1 + word.length <= max) lines[last] += ` ${word}`;
    else lines.push(word);
  }
  return lines.length ? lines : [text];
}

/**
 * Longest chart-title line, in characters: at most about 280 px at 14 px semi-bold (wide
 * letters and capitals included), so a title fits a chart on a 390 px phone screen (≈ 330 px).
 */
export const TITLE_LINE_CHARS = 34;

/**
 * Vega-Lite title parameters for a chart title: wrapped onto lines (Vega draws an array as
 * multi-line text) and placed against the whole chart (`frame: "bounds"`), not just the plot,
 * so a long title never runs past the chart's right edge.
 * @example chartTitle("Electricity use by month (kWh)") // { text: "Electricity use by month (kWh)", frame: "bounds" }
 */
export function chartTitle(text: string): { text: string | string[]; frame: "bounds" } {
  const lines = wrapLabel(text, TITLE_LINE_CHARS);
  return { text: lines.length > 1 ? lines : text, frame: "bounds" };
}
