import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtemp, readFile, readdir, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import Eleventy from "@11ty/eleventy";
import EleventyVitePlugin from "@11ty/eleventy-plugin-vite";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { viteOptions, writeSite } from "../../src/site/writeSite.ts";
import { prepareSite } from "../../src/site/prepareSite.ts";
import { applyClientBundle, relativeRoot, type ClientBundle } from "../../src/site/clientBundle.ts";
import { fixtureInput } from "../report/fixture.ts";

const ROOT = resolve(import.meta.dirname, "..", "..");

async function files(dir: string): Promise<string[]> {
  return (await readdir(dir, { recursive: true, withFileTypes: true })).filter((e) => e.isFile()).map((e) => join(e.parentPath, e.name).slice(dir.length + 1)).sort();
}

/**
 * The reference is the site as ohmbook wrote it before the bundle was built once: Eleventy with
 * @11ty/eleventy-plugin-vite, which runs Vite over every page (the plugin's own documented use).
 */
describe("client bundle built once, pages edited as Vite edits them", () => {
  let work: string;
  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), "ohmbook-bundle-"));
    const model = buildSiteModel(fixtureInput());
    await writeSite(model, {}, join(work, "new"));
    const ready = await prepareSite(model, {});
    const eleventy = new Eleventy(join(ROOT, "content"), join(work, "ref"), {
      quietMode: true,
      configPath: join(ROOT, ".eleventy.js"),
      config(eleventyConfig) {
        eleventyConfig.addGlobalData("site", ready);
        eleventyConfig.addPassthroughCopy({ [join(ROOT, "content", "assets")]: "assets" });
        eleventyConfig.addPlugin(EleventyVitePlugin, { tempFolderName: join(work, ".11ty-vite"), viteOptions: viteOptions(false, () => {}) });
      },
    });
    eleventy.disableLogger();
    await eleventy.write();
  }, 120_000);

  afterAll(async () => {
    await rm(work, { recursive: true, force: true });
  });

  it("writes the same pages and assets, byte for byte, as Vite over every page", async () => {
    const ref = await files(join(work, "ref"));
    const ours = (await files(join(work, "new"))).filter((f) => f !== ".ohmbook-site");
    expect(ours).toEqual(ref);
    expect(ref.filter((f) => f.endsWith(".html")).length).toBeGreaterThan(5);
    for (const f of ref) {
      const a = await readFile(join(work, "ref", f));
      const b = await readFile(join(work, "new", f));
      expect(b.equals(a), f).toBe(true);
    }
  });
});

describe("applyClientBundle", () => {
  const bundle: ClientBundle = { headTags: ['<script type="module" src="./assets/site-abc.js"></script>', '<link rel="stylesheet" href="./assets/site-def.css">'], files: [] };
  const page = (root: string, extra = "") =>
    `<!doctype html>\n<html>\n<head>\n<link rel="canonical" href="/x.html" vite-ignore>\n<link rel="stylesheet" href="${root}assets/site.css">\n<script type="module" src="${root}assets/site.js"></script>\n</head>\n<body>${extra}</body>\n</html>\n`;

  it("relative roots as Vite writes them for base './'", () => {
    expect(relativeRoot("index.html")).toBe("./");
    expect(relativeRoot("buildings/a.html")).toBe("../");
    expect(relativeRoot("bills/a/b.html")).toBe("../../");
  });

  it("removes the source tags with the line break before them, keeps the space vite-ignore leaves, injects before </head>", () => {
    expect(applyClientBundle(page("../"), "buildings/a.html", bundle)).toBe(
      `<!doctype html>\n<html>\n<head>\n<link rel="canonical" href="/x.html" >\n  <script type="module" src="../assets/site-abc.js"></script>\n  <link rel="stylesheet" href="../assets/site-def.css">\n</head>\n<body></body>\n</html>\n`,
    );
    expect(applyClientBundle(page(""), "index.html", bundle)).toContain(`  <script type="module" src="./assets/site-abc.js"></script>\n`);
  });

  it("takes the line break and indentation before a source tag, and only those (as the pattern (\\n[ \\t]*)?<tag…> does)", () => {
    const head = (css: string) => `<!doctype html>\n<html>\n<head>${css}\n<script type="module" src="./assets/site.js"></script>\n</head>\n<body></body>\n</html>\n`;
    const link = '<link rel="stylesheet" href="./assets/site.css">';
    const expected = (rest: string) => `<!doctype html>\n<html>\n<head>${rest}\n  <script type="module" src="./assets/site-abc.js"></script>\n  <link rel="stylesheet" href="./assets/site-def.css">\n</head>\n<body></body>\n</html>\n`;
    expect(applyClientBundle(head(`\n\t ${link}`), "index.html", bundle)).toBe(expected(""));
    expect(applyClientBundle(head(`\n\n${link}`), "index.html", bundle)).toBe(expected("\n"));
    expect(applyClientBundle(head(`\nx ${link}`), "index.html", bundle)).toBe(expected("\nx "));
    expect(applyClientBundle(head(`<title>t</title>${link}`), "index.html", bundle)).toBe(expected("<title>t</title>"));
  });

  it("refuses what Vite would rewrite and this does not", () => {
    expect(() => applyClientBundle(page("", '<img src="logo.png" alt="">'), "index.html", bundle)).toThrow(/local asset URL/);
    expect(() => applyClientBundle(page("", "<style>p{}</style>"), "index.html", bundle)).toThrow(/inline <style>/);
    expect(() => applyClientBundle(page("", '<link rel="stylesheet" href="print.css">'), "index.html", bundle)).toThrow(/other than/);
    expect(() => applyClientBundle(page("").replace(/<script[^\n]*\n/, ""), "index.html", bundle)).toThrow(/expected one <script>/);
    // Fragment links, data URLs and absolute URLs are left alone, as Vite leaves them.
    expect(() => applyClientBundle(page("", '<svg><use href="#m"></use></svg><img src="data:," alt="">'), "index.html", bundle)).not.toThrow();
  });
});
