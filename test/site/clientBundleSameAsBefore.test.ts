/**
 * applyClientBundle now reads a page once for every place its rules can apply and makes the
 * result from slices of it, instead of one pass and one copy of the page per edit. That must not
 * change a page: on generated pages (the source tags with every kind of line break and
 * indentation before them, vite-ignore in several spellings and places, upper-case tags, SVG,
 * style attributes, text holding the rules' words, and the things it refuses), it writes exactly
 * the page, or throws exactly the error, of the code before it (test/site/former/clientBundleEdits.ts,
 * a verbatim copy of commit e917b56). Tolerance: none (string equality).
 */
import { describe, expect, it } from "vitest";
import { applyClientBundle, type ClientBundle } from "../../src/site/clientBundle.ts";
import { applyClientBundle as formerApply } from "./former/clientBundleEdits.ts";
import { mulberry32 } from "../../src/core/random.ts";

const bundle: ClientBundle = { headTags: ['<script type="module" src="./assets/site-abc.js"></script>', '<link rel="stylesheet" href="./assets/site-def.css">'], files: [] };

const SPACE = ["\n", "\n  ", "\n\t ", " ", "", "\n\n", "\nx ", "\t", "\n \n "];
const HEAD_EXTRA = [
  '<meta charset="utf-8">',
  "<title>Meter – bills · Trust</title>",
  '<link rel="icon" href="data:,">',
  '<link rel="canonical" href="/x.html" vite-ignore>',
  '<link rel="canonical" href="/x.html" vite-ignore="">',
  '<link rel="canonical" href="/x.html" VITE-IGNORE >',
  '<link rel="canonical" vite-ignore href="/x.html">',
  '<meta name="x" content="vite-ignore">',
  '<LINK rel="icon" href="data:,">',
  '<link rel="preload" href="data:,">',
];
const BODY = [
  "<p>Use fell 3 % – the style of the meter</p>",
  '<svg class="marks" role="img"><g><path d="M0,0L1,1" style="fill:#123"/><text x="1">Jan–Feb</text></g><use href="#m"></use></svg>',
  '<span style="color:red">a</span>',
  '<script type="application/json" class="chart-spec">{"mark":"bar","style":"x","vite-ignore":1}</script>',
  '<a href="x.html" vite-ignore>x</a>',
  '<img src="data:," alt="">',
  '<input value="x">',
  '<table><tr><td>−$1,234</td></tr></table>',
  "<p>a <link> word and vite-ignore and style= in text</p>",
  '<IMG SRC="https://example.org/a.png">',
  '<source srcset="#x">',
];
const REFUSED = [
  '<img src="logo.png" alt="">',
  "<style>p{}</style>",
  '<div style="background:url(x.png)">x</div>',
  '<link rel="stylesheet" href="print.css">',
  '<script type="module" src="x.js"></script>',
  '<video poster="a.png"></video>',
];

function pick<T>(rand: () => number, list: readonly T[]): T {
  return list[Math.floor(rand() * list.length)]!;
}

/** A page as the templates might write it, now and then with a mistake the writer must refuse. */
function page(rand: () => number, root: string): string {
  const css = `<link rel="stylesheet" href="${root}assets/site.css">`;
  const js = `<script type="module" src="${root}assets/site.js"></script>${rand() < 0.2 ? "\n" : ""}`;
  const head: string[] = [];
  for (let k = Math.floor(rand() * 4); k > 0; k--) head.push(pick(rand, SPACE) + pick(rand, HEAD_EXTRA));
  const sources = [css, js];
  if (rand() < 0.05) sources.push(pick(rand, [css, js]));
  if (rand() < 0.05) sources.splice(Math.floor(rand() * sources.length), 1);
  for (const s of sources) head.splice(Math.floor(rand() * (head.length + 1)), 0, pick(rand, SPACE) + s);
  const body: string[] = [];
  for (let k = 1 + Math.floor(rand() * 6); k > 0; k--) body.push(pick(rand, SPACE) + pick(rand, BODY));
  if (rand() < 0.1) body.push(pick(rand, REFUSED));
  const close = rand() < 0.03 ? "" : `${pick(rand, ["\n", "\n  ", "\n\t", " ", ""])}${rand() < 0.1 ? "</HEAD>" : "</head>"}`;
  return `<!doctype html>\n<html lang="en">\n<head>${head.join("")}${close}\n<body>${body.join("")}</body>\n</html>\n`;
}

function outcome(apply: typeof applyClientBundle, html: string, path: string): string {
  try {
    return `page:${apply(html, path, bundle)}`;
  } catch (error) {
    return `error:${(error as Error).message}`;
  }
}

describe("applyClientBundle writes and refuses the same pages as before", () => {
  it("on 4,000 generated pages at three depths", () => {
    const rand = mulberry32(17);
    let refused = 0;
    for (let k = 0; k < 4000; k++) {
      const [root, path] = pick(rand, [["", "index.html"], ["../", "buildings/a.html"], ["../../", "bills/a/b.html"]] as const);
      const html = page(rand, root);
      const expected = outcome(formerApply, html, path);
      if (expected.startsWith("error:")) refused++;
      expect(outcome(applyClientBundle, html, path), html).toBe(expected);
    }
    // Both kinds are exercised: most pages are written, a share refused.
    expect(refused).toBeGreaterThan(200);
    expect(refused).toBeLessThan(2000);
  });
});
