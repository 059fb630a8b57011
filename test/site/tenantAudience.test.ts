// `build --audience tenants` (outputs.md, "Audiences (v2)"): a site of tenant pages only. The
// crawl fails on any internal page, data file, money figure or link that leaves the tenant site.
import { describe, expect, it } from "vitest";
import { mkdtemp, readdir, readFile, rm, stat } from "node:fs/promises";
import { tmpdir } from "node:os";
import { dirname, join, relative, resolve } from "node:path";
import { buildPortfolioSite } from "../../src/pipeline/build.ts";

async function files(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const e of await readdir(dir, { withFileTypes: true, recursive: true })) if (e.isFile()) out.push(relative(dir, join(e.parentPath, e.name)));
  return out.sort();
}

describe("tenant audience", () => {
  it("writes only the tenant pages, their front page and assets; nothing internal is reachable", async () => {
    const root = await mkdtemp(join(tmpdir(), "ohmbook-tenants-"));
    try {
      const out = join(root, "site");
      await buildPortfolioSite({ dir: "data/demo", outDir: out, strict: false, audience: "tenants" });
      const all = await files(out);
      const pages = all.filter((f) => f.endsWith(".html"));
      // the demo publishes tenant pages for ashelm and willow-clinic (buildings.csv tenant_page = yes)
      expect(pages).toEqual(["buildings/ashelm/tenant.html", "buildings/willow-clinic/tenant.html", "index.html"]);
      // Each tenant page carries its charts (one per commodity the building has: electricity, gas, water).
      for (const page of pages.filter((p) => p.endsWith("tenant.html"))) {
        expect((await readFile(join(out, page), "utf8")).match(/<figure class="chart" data-chart/g), page).toHaveLength(3);
      }
      expect(all.filter((f) => !f.endsWith(".html") && !f.startsWith("assets/") && f !== ".ohmbook-site")).toEqual([]);
      expect(all.some((f) => /\.(csv|json)$/.test(f))).toBe(false);
      for (const page of pages) {
        const html = await readFile(join(out, page), "utf8");
        // Chart specs (JSON in the page) are crawled too; only their Vega schema key may hold a "$".
        const text = html.replace(/<[^>]+>/g, " ").replace(/"\$schema":"https:\/\/vega\.github\.io\/schema\/vega\/v\d+\.json"/g, "");
        expect(text, page).not.toMatch(/\$|USD|dispute|claim|finding|audit|tariff|CV\(RMSE\)/i);
        for (const [, attr, url] of html.matchAll(/\s(href|src)="([^"]*)"/g)) {
          if (url.startsWith("#") || url.startsWith("data:") || html.includes(`rel="canonical" href="${url}"`)) continue;
          expect(url, `${page}: ${attr}`).not.toMatch(/^(\/|[a-z]+:)/i); // relative only
          const target = resolve(dirname(join(out, page)), url.split("#")[0]);
          expect(target.startsWith(out), `${page} → ${url}`).toBe(true);
          await expect(stat(target), `${page} → ${url}`).resolves.toBeTruthy();
        }
      }
    } finally {
      await rm(root, { recursive: true, force: true });
    }
  }, 180_000);
});
