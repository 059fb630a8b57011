import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdir, mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { pathToFileURL } from "node:url";
import Eleventy from "@11ty/eleventy";
import nunjucks from "nunjucks";
import { cacheNunjucksTemplates, nunjucksCompileCount } from "../../src/site/nunjucksCache.ts";

/** A tiny site: a layout, an imported macro, a paginated template with a templated string permalink. */
const FILES: Record<string, string> = {
  "_includes/base.njk": "<main>{{ content | safe }}</main>\n",
  "_includes/m.njk": "{% macro item(x) %}<li>{{ x.name }}</li>{% endmacro %}",
  "page.njk": [
    "---",
    "layout: base.njk",
    "pagination: { data: items, size: 1, alias: it }",
    'permalink: "p/{{ it.id }}.html"',
    "---",
    '{%- from "m.njk" import item -%}',
    "<ul>{{ item(it) }}</ul>{% if it.id == 2 %}two{% endif %}",
  ].join("\n"),
  "index.njk": "---\npermalink: index.html\n---\n{% for i in items %}{{ i.name }};{% endfor %}",
};
const ITEMS = [
  { id: 1, name: "A & <b>" },
  { id: 2, name: "B" },
  { id: 3, name: "C" },
];

async function render(input: string, cached: boolean): Promise<Record<string, string>> {
  const eleventy = new Eleventy(input, join(input, "_out"), {
    quietMode: true,
    config(eleventyConfig) {
      eleventyConfig.setNunjucksEnvironmentOptions({ autoescape: true });
      eleventyConfig.addGlobalData("items", ITEMS);
      if (cached) cacheNunjucksTemplates(eleventyConfig);
    },
  });
  eleventy.disableLogger();
  const pages = await eleventy.toJSON();
  return Object.fromEntries(pages.map((p) => [p.url, p.content]));
}

describe("cacheNunjucksTemplates", () => {
  let input: string;
  let other: string;
  beforeAll(async () => {
    input = await mkdtemp(join(tmpdir(), "ohmbook-njk-"));
    // The same site with different template text: compiled afresh whichever test runs first.
    other = await mkdtemp(join(tmpdir(), "ohmbook-njk-"));
    for (const [dir, tail] of [[input, ""], [other, "{# other #}"]]) {
      await mkdir(join(dir, "_includes"));
      for (const [name, text] of Object.entries(FILES)) await writeFile(join(dir, name), text + tail);
    }
  });
  afterAll(async () => {
    await rm(input, { recursive: true, force: true });
    await rm(other, { recursive: true, force: true });
  });

  it("renders exactly what Eleventy's own Nunjucks engine renders (escaping, layout, imports, templated permalinks)", async () => {
    const plain = await render(input, false);
    expect(plain["/p/1.html"]).toBe("<main><ul><li>A &amp; &lt;b&gt;</li></ul></main>\n");
    expect(await render(input, true)).toEqual(plain);
  });

  it("compiles each template once: a page per item does not compile again, nor does a later Eleventy run", async () => {
    const before = nunjucksCompileCount();
    await render(other, true);
    const first = nunjucksCompileCount() - before;
    // page.njk, its permalink, index.njk and its permalink, the layout, the imported m.njk: at
    // most one compile each, whatever the number of pages.
    expect(first).toBeGreaterThan(0);
    expect(first).toBeLessThanOrEqual(6);
    await render(other, true);
    await render(other, true);
    expect(nunjucksCompileCount() - before).toBe(first);
  });

  it("compiles an imported template once per process, not once per Eleventy run", async () => {
    const plain = await render(other, false);
    await render(other, true);
    // Nunjucks' own compiler (the module Eleventy's engine uses) is not called again: the
    // imported m.njk comes back from its loader as compiled code.
    const compiler = nunjucks.compiler as { compile: (...args: unknown[]) => string };
    const compile = compiler.compile;
    let calls = 0;
    compiler.compile = (...args: unknown[]) => {
      calls++;
      return compile(...args);
    };
    try {
      expect(await render(other, true)).toEqual(plain);
    } finally {
      compiler.compile = compile;
    }
    expect(calls).toBe(0);
  });

  it("regression: leaves Eleventy's static compile cache empty, which would keep each run's environment and pages alive", async () => {
    // Eleventy's module, the very instance the Eleventy class uses (not in its package exports).
    const url = pathToFileURL(resolve("node_modules/@11ty/eleventy/src/TemplateContent.js")).href;
    const { default: TemplateContent } = (await import(url)) as { default: { _compileCache: Map<string, Map<string, unknown>> } };
    await render(input, true);
    const held = [...TemplateContent._compileCache.values()].reduce((n, m) => n + m.size, 0);
    expect(TemplateContent._compileCache.size).toBeGreaterThan(0);
    expect(held).toBe(0);
  });
});
