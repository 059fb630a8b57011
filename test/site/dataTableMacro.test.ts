import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import fc from "fast-check";
import nunjucks from "nunjucks";

/** The dataTable macro of the site (content/_includes/macros.njk) and the former one, verbatim. */
const MACROS = dataTableMacro(readFileSync(new URL("../../content/_includes/macros.njk", import.meta.url), "utf8"));
const FORMER = dataTableMacro(readFileSync(new URL("./former/dataTableMacro.njk", import.meta.url), "utf8"));

function dataTableMacro(text: string): string {
  const start = text.indexOf("{% macro dataTable(");
  const end = text.indexOf("{% endmacro %}", start);
  if (start === -1 || end === -1) throw new Error("no dataTable macro");
  return text.slice(start, end + "{% endmacro %}".length);
}

// As Eleventy's environment for the site (.eleventy.js): autoescape on.
const env = new nunjucks.Environment(null, { autoescape: true });

function render(macros: string, t: unknown, root: string): string {
  return env.renderString(`${macros}{{ dataTable(t, root) }}`, { t, root });
}

const text = fc.oneof(fc.string({ maxLength: 12 }), fc.constantFrom("A & <b>", "\"quoted\" 'x'", "—", ""));
const optional = <T>(arb: fc.Arbitrary<T>) => fc.option(arb, { nil: undefined });
const cell = fc.record(
  {
    text,
    href: optional(fc.constantFrom("buildings/a.html", "x?a=1&b=<2>", "")),
    note: optional(text),
    tone: fc.constantFrom(undefined, null, "", "bad", "good", "<warn>", 0, 3),
    sort: fc.constantFrom(undefined, null, "", 0, 12.5, "2025-01", "<s>"),
  },
  { requiredKeys: ["text"] },
);
const table = fc
  .record({
    caption: text,
    sortable: fc.boolean(),
    columns: fc.array(fc.record({ label: text, numeric: fc.constantFrom(true, false, undefined) }), { minLength: 1, maxLength: 5 }),
  })
  .chain((t) => fc.record({ caption: fc.constant(t.caption), sortable: fc.constant(t.sortable), columns: fc.constant(t.columns), rows: fc.array(fc.array(cell, { minLength: 0, maxLength: t.columns.length + 1 }), { maxLength: 6 }) }));

describe("dataTable macro (content/_includes/macros.njk)", () => {
  // Tolerance: none. The cells' classes are now written without building a list; the markup must
  // be the same, byte for byte, for any table: numeric columns, tones, sort keys, links, notes,
  // escaping, and rows shorter or longer than the header.
  it("writes the same markup as the former macro for any table", () => {
    fc.assert(
      fc.property(table, fc.constantFrom("", "../", "../../"), (t, root) => {
        expect(render(MACROS, t, root)).toBe(render(FORMER, t, root));
      }),
      { numRuns: 300 },
    );
  });

  it("writes a numeric cell with a tone as one class list", () => {
    const t = { caption: "c", columns: [{ label: "Name" }, { label: "Amount", numeric: true }], rows: [[{ text: "a" }, { text: "1", tone: "bad", sort: 1 }]] };
    expect(render(MACROS, t, "")).toContain('<td data-label="Amount" class="num tone-bad" data-sort="1">1</td>');
  });
});
