/**
 * The page edits of src/site/clientBundle.ts (applyClientBundle) as they were before they were
 * made in one pass over the page (commit e917b56), kept only so that
 * test/site/clientBundleSameAsBefore.test.ts can show that the current code writes the same pages
 * and refuses the same ones. Not for use outside that test.
 */
import type { ClientBundle } from "../../../src/site/clientBundle.ts";

const SOURCE_CSS = "assets/site.css";
const SOURCE_JS = "assets/site.js";

/** `./` at the site's root, `../` per folder below it, as Vite writes relative URLs (base `./`). */
export function relativeRoot(pagePath: string): string {
  const depth = pagePath.split("/").length - 1;
  return depth === 0 ? "./" : "../".repeat(depth);
}

function escapeRegExp(s: string): string {
  return s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
}

/** Things Vite would rewrite in a page that `applyClientBundle` does not: refused, never skipped. */
const UNHANDLED: { re: RegExp; what: string }[] = [
  { re: /<style[\s>]/i, what: "an inline <style> element" },
  { re: /\sstyle\s*=\s*("[^"]*(url|image-set)\(|'[^']*(url|image-set)\()/i, what: "a style attribute with url()" },
  { re: /<(img|image|use|audio|video|source|track|embed|object|input)\b[^>]*\s(src|srcset|href|xlink:href|data|poster)\s*=\s*["']?(?![#"']|data:|https?:|\/\/)/i, what: "an element with a local asset URL (img, image, use, media, object, input)" },
];

/** The source stylesheet link and module script, each as a pattern of the whole tag (sticky: tried where its opener stands). */
const SOURCE_TAGS = [
  { url: SOURCE_CSS, tag: "link", opener: "<link", re: sourceTagPattern("link", "href", SOURCE_CSS, "") },
  { url: SOURCE_JS, tag: "script", opener: "<script", re: sourceTagPattern("script", "src", SOURCE_JS, "\\s*</script>") },
];

function sourceTagPattern(tag: string, attr: string, url: string, close: string): RegExp {
  // The template writes the URL relative to the page (`assets/…`, `./assets/…` or `../assets/…`).
  return new RegExp(`<${tag}\\b[^>]*\\b${attr}="(?:\\./|(?:\\.\\./)*)${escapeRegExp(url)}"[^>]*>${close}`, "y");
}

/**
 * `html` without each whole tag `re` matches where `opener` stands, each taken with the line
 * break and indentation before it when only spaces or tabs stand between them: what
 * `html.replace(/(\n[ \t]*)?<tag…>/g, "")` does, but found with indexOf instead of trying the
 * pattern (and its optional group) at every character of the page. Also returns how many.
 */
function removeTags(html: string, opener: string, re: RegExp): { html: string; found: number } {
  let out = "";
  let last = 0;
  let found = 0;
  for (let at = html.indexOf(opener); at !== -1; ) {
    re.lastIndex = at;
    const m = re.exec(html);
    if (m === null) {
      at = html.indexOf(opener, at + 1);
      continue;
    }
    let start = at;
    // The previous match ends with ">", so this walk never reaches into it.
    while (start > last && (html[start - 1] === " " || html[start - 1] === "\t")) start--;
    start = start > last && html[start - 1] === "\n" ? start - 1 : at;
    out += html.slice(last, start);
    last = at + m[0].length;
    found++;
    at = html.indexOf(opener, last);
  }
  return { html: found === 0 ? html : out + html.slice(last), found };
}

/**
 * `html` (a page at `pagePath`, relative to the site's root) with the edits Vite makes to it:
 * the source stylesheet link and module script removed (each with the blank line before it),
 * `vite-ignore` attributes removed, and the bundle's tags injected before `</head>`.
 * @throws Error when the page has something else Vite would rewrite (see UNHANDLED).
 * @example applyClientBundle(page, "buildings/a.html", bundle)
 */
export function applyClientBundle(html: string, pagePath: string, bundle: ClientBundle): string {
  const root = relativeRoot(pagePath);
  let out = html;
  for (const { url, tag, opener, re } of SOURCE_TAGS) {
    const removed = removeTags(out, opener, re);
    out = removed.html;
    if (removed.found !== 1) throw new Error(`${pagePath}: expected one <${tag}> of ${url}, found ${removed.found}; every page links the site's stylesheet and script once (content/_includes/base.njk)`);
  }
  if (/<link\b[^>]*rel="stylesheet"/i.test(out) || /<script\b[^>]*type="module"/i.test(out)) {
    throw new Error(`${pagePath}: a stylesheet or module script other than ${SOURCE_CSS} and ${SOURCE_JS}; add it to content/assets/site.js instead`);
  }
  for (const u of UNHANDLED) {
    if (u.re.test(out)) throw new Error(`${pagePath}: the page has ${u.what}, which the site writer does not bundle; link assets from content/assets/site.js or site.css instead`);
  }
  // Vite removes the attribute itself, not the space before it: `href="…" vite-ignore>` → `href="…" >`.
  // Looking for the word first is a few times cheaper than the pattern, and pages rarely hold it.
  if (/vite-ignore/i.test(out)) out = out.replace(/(<[a-z][^>]*?\s)vite-ignore(?:="")?(?=[\s>/])/gi, "$1");
  const indent = /([ \t]*)<\/head>/i.exec(out);
  if (!indent) throw new Error(`${pagePath}: the page has no </head>`);
  const pad = `${indent[1]}${indent[1]![0] === "\t" ? "\t" : "  "}`;
  const tags = bundle.headTags.map((t) => `${pad}${t.replace(/(href|src)="\.\//g, `$1="${root}`)}\n`).join("");
  return out.replace(/([ \t]*)<\/head>/i, (m) => `${tags}${m}`);
}

