/**
 * Same-folder assets without `crossorigin`. Vite marks the stylesheet and module script it
 * injects with `crossorigin`; for a page opened from disk (file://) the document's origin is
 * null, so Chromium makes that a failing CORS request and the page shows unstyled. The assets
 * sit beside the pages, so the attribute buys nothing: it is removed from `<link>` and
 * `<script>` tags whose URL is relative (no scheme, no `//`). The module script still needs
 * HTTP to run; the styled tables and the server-rendered SVG charts do not.
 */

/**
 * `html` with `crossorigin` removed from link and script tags of relative URLs.
 * @example dropSameFolderCrossorigin('<link rel="stylesheet" crossorigin href="./assets/a.css">') === '<link rel="stylesheet" href="./assets/a.css">'
 */
export function dropSameFolderCrossorigin(html: string): string {
  return html.replace(/<(link|script)\b[^>]*>/gi, (tag) => {
    const url = /\b(?:href|src)\s*=\s*["']([^"']*)["']/i.exec(tag)?.[1];
    if (url === undefined || /^[a-z][a-z0-9+.-]*:|^\/\//i.test(url)) return tag;
    return tag.replace(/\s+crossorigin(?:\s*=\s*(?:"[^"]*"|'[^']*'|[^\s>]+))?(?=[\s/>])/gi, "");
  });
}

/** A Vite plugin applying dropSameFolderCrossorigin to every page after Vite's own HTML changes. */
export function sameFolderAssetsPlugin(): Record<string, unknown> {
  return {
    name: "ohmbook-same-folder-assets",
    enforce: "post",
    transformIndexHtml: { order: "post", handler: (html: string) => dropSameFolderCrossorigin(html) },
  };
}
