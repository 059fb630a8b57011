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

