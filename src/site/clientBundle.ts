/**
 * The client bundle, built once per site. Vite bundles content/assets (site.js and site.css, with
 * the vega runtime) from two stub pages — the same bundle, with the same hashed names, that it
 * makes from every page of the site — and each page rendered by Eleventy is then given exactly the
 * edits Vite makes to a page (vite/src/node/plugins/html.ts): the source `<link rel="stylesheet">`
 * and `<script type="module">` removed with the blank line before them, `vite-ignore` attributes
 * removed, and the bundle's tags injected before `</head>`, with URLs relative to the page. So
 * pages are never held by Vite, all at once, as strings; the site is byte-identical to one built
 * through the Vite plugin (test/site/clientBundle.test.ts builds both).
 *
 * Vite rewrites more than that (images, inline styles, other stylesheets and module scripts); a page
 * with any of those is refused with a clear error rather than published differently.
 */
import { copyFile, mkdir, readdir, readFile, rm, writeFile } from "node:fs/promises";
import { join } from "node:path";
import { build } from "vite";

/** The page-relative URLs of the two source assets every page links (base.njk). */
const SOURCE_CSS = "assets/site.css";
const SOURCE_JS = "assets/site.js";

export interface ClientBundle {
  /** Tags Vite injects before `</head>`, serialized with `./` URLs (a page at the site's root). */
  headTags: string[];
  /** Files the bundle wrote under the site folder (relative, `/`-separated). */
  files: string[];
}

async function copyTree(from: string, to: string): Promise<void> {
  await mkdir(to, { recursive: true });
  for (const entry of await readdir(from, { withFileTypes: true })) {
    if (entry.isDirectory()) await copyTree(join(from, entry.name), join(to, entry.name));
    else await copyFile(join(from, entry.name), join(to, entry.name));
  }
}

async function listFiles(dir: string, prefix = ""): Promise<string[]> {
  const out: string[] = [];
  for (const entry of await readdir(dir, { withFileTypes: true })) {
    const rel = prefix ? `${prefix}/${entry.name}` : entry.name;
    if (entry.isDirectory()) out.push(...(await listFiles(join(dir, entry.name), rel)));
    else out.push(rel);
  }
  return out.sort();
}

const STUB = (name: string) =>
  `<!doctype html>\n<html lang="en">\n<head>\n<title>${name}</title>\n<link rel="stylesheet" href="./${SOURCE_CSS}">\n<script type="module" src="./${SOURCE_JS}"></script>\n</head>\n<body>\n</body>\n</html>\n`;

/**
 * Bundles `contentDir/assets` with Vite into `siteDir` (which Vite empties first) and returns the
 * tags to inject. `viteOptions` are the site's (base, plugins, aliases); `workDir` a scratch folder.
 */
export async function buildClientBundle(contentDir: string, siteDir: string, workDir: string, viteOptions: Record<string, unknown>): Promise<ClientBundle> {
  const root = join(workDir, "bundle-src");
  await copyTree(join(contentDir, "assets"), join(root, "assets"));
  // Two pages: the code they share goes to a chunk named after site.js, as with a whole site.
  const stubs = ["ohmbook-stub-a", "ohmbook-stub-b"];
  for (const s of stubs) await writeFile(join(root, `${s}.html`), STUB(s), "utf8");
  const build_ = (viteOptions.build ?? {}) as Record<string, unknown>;
  await build({
    ...viteOptions,
    appType: "mpa",
    root,
    build: {
      ...build_,
      outDir: siteDir,
      emptyOutDir: true,
      rollupOptions: { input: Object.fromEntries(stubs.map((s) => [s, join(root, `${s}.html`)])) },
    },
  });
  const html = await readFile(join(siteDir, `${stubs[0]}.html`), "utf8");
  for (const s of stubs) await rm(join(siteDir, `${s}.html`));
  await rm(root, { recursive: true, force: true });
  const head = /<\/title>\n([\s\S]*?)<\/head>/.exec(html)?.[1];
  if (head === undefined) throw new Error("the client bundle's stub page has no head");
  const headTags = head.split("\n").filter((l) => l.trim() !== "").map((l) => l.trim());
  if (headTags.length === 0) throw new Error("Vite injected no script or stylesheet into the stub page");
  return { headTags, files: await listFiles(siteDir) };
}

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
  { re: /<style[\s>]/iy, what: "an inline <style> element" },
  { re: /\sstyle\s*=\s*("[^"]*(url|image-set)\(|'[^']*(url|image-set)\()/iy, what: "a style attribute with url()" },
  { re: /<(img|image|use|audio|video|source|track|embed|object|input)\b[^>]*\s(src|srcset|href|xlink:href|data|poster)\s*=\s*["']?(?![#"']|data:|https?:|\/\/)/iy, what: "an element with a local asset URL (img, image, use, media, object, input)" },
];

/** Other stylesheets and module scripts, which Vite would bundle too. */
const OTHER_STYLESHEET = /<link\b[^>]*rel="stylesheet"/iy;
const OTHER_MODULE = /<script\b[^>]*type="module"/iy;

/** Vite removes the attribute itself, not the space before it: `href="…" vite-ignore>` → `href="…" >`. */
const VITE_IGNORE = /(<[a-z][^>]*?\s)vite-ignore(?:="")?(?=[\s>/])/gi;

/** The source stylesheet link and module script, each as a pattern of the whole tag (sticky: tried where its opener stands). */
const SOURCE_TAGS = [
  { url: SOURCE_CSS, tag: "link", re: sourceTagPattern("link", "href", SOURCE_CSS, "") },
  { url: SOURCE_JS, tag: "script", re: sourceTagPattern("script", "src", SOURCE_JS, "\\s*</script>") },
];

function sourceTagPattern(tag: string, attr: string, url: string, close: string): RegExp {
  // The template writes the URL relative to the page (`assets/…`, `./assets/…` or `../assets/…`).
  return new RegExp(`<${tag}\\b[^>]*\\b${attr}="(?:\\./|(?:\\.\\./)*)${escapeRegExp(url)}"[^>]*>${close}`, "y");
}

/**
 * Every place where one of the patterns above can start: the tags they begin with, and the words
 * `style` (an attribute, after a space) and `vite-ignore`. Each pattern begins with one of these,
 * so trying it only here finds what trying it at every character finds, in one pass over the page
 * instead of one per pattern (pages are up to a megabyte of two-byte characters).
 */
const SPOTS = /<(link|script|style|img|image|use|audio|video|source|track|embed|object|input)\b|style|vite-ignore/gi;

interface Spot {
  at: number;
  /** `<` and the tag name in lower case (`<link`), or the word in lower case (`style`, `vite-ignore`). */
  what: string;
}

function spotsOf(html: string): Spot[] {
  const out: Spot[] = [];
  SPOTS.lastIndex = 0;
  for (let m = SPOTS.exec(html); m !== null; m = SPOTS.exec(html)) out.push({ at: m.index, what: m[1] === undefined ? m[0].toLowerCase() : `<${m[1].toLowerCase()}` });
  return out;
}

/** Whether sticky pattern `re` matches `html` at `at`. */
function matchesAt(re: RegExp, html: string, at: number): RegExpExecArray | null {
  re.lastIndex = at;
  return re.exec(html);
}

/** Ranges [start, end) of the page taken out, in order, none overlapping. */
class Removals {
  readonly starts: number[] = [];
  readonly ends: number[] = [];
  /** Whether position `at` lies inside a removed range. */
  covers(at: number): boolean {
    for (let k = 0; k < this.starts.length; k++) if (at >= this.starts[k]! && at < this.ends[k]!) return true;
    return false;
  }
  /** The position of the character before `at` in the page with the ranges taken out (−1 at the start). */
  before(at: number): number {
    let p = at;
    for (let k = this.ends.length - 1; k >= 0; k--) if (this.ends[k] === p) p = this.starts[k]!;
    return p - 1;
  }
  /**
   * The spaces and tabs just before `at` in the page with the ranges taken out, not reaching below
   * `floor`: where they start, and what they are.
   */
  blanksBefore(html: string, at: number, floor: number): { start: number; blanks: string } {
    let start = at;
    let blanks = "";
    for (let p = this.before(start); p >= floor && (html[p] === " " || html[p] === "\t"); p = this.before(start)) {
      blanks = html[p] + blanks;
      start = p;
    }
    return { start, blanks };
  }
  add(start: number, end: number): void {
    // Kept in order; a range whose line break was found before removed ones takes them in.
    let k = 0;
    while (k < this.starts.length && this.starts[k]! < start) k++;
    let n = 0;
    while (k + n < this.starts.length && this.ends[k + n]! <= end) n++;
    this.starts.splice(k, n, start);
    this.ends.splice(k, n, end);
  }
}

/**
 * Takes out each source tag `re` matches at the spots named `tag`, with the line break and
 * indentation before it when only spaces or tabs stand between them, as
 * `html.replace(/(\n[ \t]*)?<tag…>/g, "")` would over the page as earlier removals left it.
 * Returns how many.
 */
function removeSourceTags(html: string, spots: readonly Spot[], tag: string, re: RegExp, removed: Removals): number {
  let found = 0;
  // No walk reaches into the previous match of this pattern (it ends with ">").
  let last = 0;
  for (const { at, what } of spots) {
    if (what !== `<${tag}` || at < last || removed.covers(at)) continue;
    const m = matchesAt(re, html, at);
    if (m === null) continue;
    const p = removed.before(removed.blanksBefore(html, at, last).start);
    const start = p >= last && html[p] === "\n" ? p : at;
    last = at + m[0].length;
    removed.add(start, last);
    found++;
  }
  return found;
}

/**
 * `html` (a page at `pagePath`, relative to the site's root) with the edits Vite makes to it:
 * the source stylesheet link and module script removed (each with the blank line before it),
 * `vite-ignore` attributes removed, and the bundle's tags injected before `</head>`.
 *
 * The page is read once for the places any rule can apply (spotsOf) and the result made from
 * slices of it, instead of a pass and a copy per edit: the same page as making the edits one after
 * another (test/site/clientBundleSameAsBefore.test.ts), for pages whose tags each close before
 * the next one opens.
 * @throws Error when the page has something else Vite would rewrite (see UNHANDLED).
 * @example applyClientBundle(page, "buildings/a.html", bundle)
 */
export function applyClientBundle(html: string, pagePath: string, bundle: ClientBundle): string {
  const root = relativeRoot(pagePath);
  const spots = spotsOf(html);
  const removed = new Removals();
  for (const { url, tag, re } of SOURCE_TAGS) {
    const found = removeSourceTags(html, spots, tag, re, removed);
    if (found !== 1) throw new Error(`${pagePath}: expected one <${tag}> of ${url}, found ${found}; every page links the site's stylesheet and script once (content/_includes/base.njk)`);
  }
  const kept = spots.filter((s) => !removed.covers(s.at));
  if (kept.some((s) => (s.what === "<link" && matchesAt(OTHER_STYLESHEET, html, s.at)) || (s.what === "<script" && matchesAt(OTHER_MODULE, html, s.at)))) {
    throw new Error(`${pagePath}: a stylesheet or module script other than ${SOURCE_CSS} and ${SOURCE_JS}; add it to content/assets/site.js instead`);
  }
  for (const u of UNHANDLED) {
    if (kept.some((s) => unhandledAt(u.re, html, s))) throw new Error(`${pagePath}: the page has ${u.what}, which the site writer does not bundle; link assets from content/assets/site.js or site.css instead`);
  }
  const edits = viteIgnoreEdits(html, kept);
  const head = headEnd(html, removed);
  if (head === null) throw new Error(`${pagePath}: the page has no </head>`);
  const pad = `${head.indent}${head.indent[0] === "\t" ? "\t" : "  "}`;
  const tags = bundle.headTags.map((t) => `${pad}${t.replace(/(href|src)="\.\//g, `$1="${root}`)}\n`).join("");
  for (let k = 0; k < removed.starts.length; k++) edits.push({ from: removed.starts[k]!, to: removed.ends[k]!, text: "" });
  edits.push({ from: head.indentStart, to: head.indentStart, text: tags });
  return spliced(html, edits);
}

/** Whether an UNHANDLED pattern matches at spot `s` (the style-attribute pattern starts at the space before the word). */
function unhandledAt(re: RegExp, html: string, s: Spot): boolean {
  if (s.what === "style") return s.at > 0 && matchesAt(re, html, s.at - 1) !== null;
  if (s.what === "vite-ignore") return false;
  return matchesAt(re, html, s.at) !== null;
}

interface Edit {
  from: number;
  to: number;
  text: string;
}

/**
 * The vite-ignore removals: VITE_IGNORE replaced in each stretch between two `>` that holds the
 * word (a match never holds `>`; its look-ahead may read the closing one), the same replacements
 * as over the whole page.
 */
function viteIgnoreEdits(html: string, spots: readonly Spot[]): Edit[] {
  const edits: Edit[] = [];
  let done = -1;
  for (const s of spots) {
    if (s.what !== "vite-ignore" || s.at < done) continue;
    const from = html.lastIndexOf(">", s.at) + 1;
    const close = html.indexOf(">", s.at);
    const to = close === -1 ? html.length : close + 1;
    const stretch = html.slice(from, to);
    const text = stretch.replace(VITE_IGNORE, "$1");
    if (text !== stretch) edits.push({ from, to, text });
    done = to;
  }
  return edits;
}

/** The first `</head>` outside the removed ranges, and the spaces or tabs before it in the edited page. */
function headEnd(html: string, removed: Removals): { indentStart: number; indent: string } | null {
  const re = /<\/head>/gi;
  for (let m = re.exec(html); m !== null; m = re.exec(html)) {
    if (removed.covers(m.index)) continue;
    const { start, blanks } = removed.blanksBefore(html, m.index, 0);
    return { indentStart: start, indent: blanks };
  }
  return null;
}

/** `html` with each edit's range replaced by its text (ranges apart; an insertion before a removal at the same place). */
function spliced(html: string, edits: Edit[]): string {
  edits.sort((a, b) => a.from - b.from || a.to - b.to);
  // Slices of the page and a concatenation, not a copy per edit: the page is copied once, when written.
  let out = "";
  let at = 0;
  for (const e of edits) {
    out += html.slice(at, e.from) + e.text;
    at = e.to;
  }
  return out + html.slice(at);
}
