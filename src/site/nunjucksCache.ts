/**
 * Compiles each Nunjucks page template once per process instead of once per page.
 *
 * Eleventy 3.1's Nunjucks engine is not cacheable: every page of a paginated template (one per
 * building, meter, tenant, claim) makes a new Nunjucks Template from the same text and compiles
 * it again, and each Eleventy pass starts over. Here `.njk` keeps Eleventy's Nunjucks engine
 * (its environment, filters, shortcodes, loaders for imports) but takes the compiled code from a
 * process-wide table keyed by the template text, so each page only wraps that code in a
 * Template of its pass's environment. Compiled Nunjucks code is plain functions of
 * (env, context, frame, runtime, cb), so it is safe to share between environments that parse
 * alike: the key holds the text, the path and what the compiler reads from the environment.
 *
 * Eleventy's own compile cache (`compileOptions.cache`) is left off on purpose: it is a static
 * Map that outlives the Eleventy instance, and each entry would keep a pass's environment, and
 * through it the pass's pages, alive (measured: the heap kept after the site grew from 77 to
 * 134 MiB at 32 buildings).
 *
 * Templates Nunjucks loads itself (imported macros) take their code from the same table, through
 * the pass's loaders (cacheLoadedTemplates). The same hook gives the runtime a cheaper Frame.set
 * (nunjucksFrameSet.ts), the same in effect.
 */
import type { UserConfig } from "@11ty/eleventy";
import { speedUpFrameSet } from "./nunjucksFrameSet.ts";

/** The parts of the nunjucks module and environment used here (Eleventy ships nunjucks 3.2). */
interface NunjucksLib {
  runtime: Parameters<typeof speedUpFrameSet>[0];
  Template: new (src: string | { type: "code"; obj: unknown }, env: NunjucksEnv, path: string | null, eagerCompile: boolean) => NunjucksTemplate;
}
interface NunjucksEnv {
  loaders?: NunjucksLoader[];
  asyncFilters: string[];
  extensionsList: { tags?: string[]; __name?: string }[];
  opts: Record<string, unknown>;
}
/** A synchronous Nunjucks loader's source of a template (FileSystemLoader's getSource). */
interface NunjucksLoader {
  async?: boolean;
  getSource(name: string): { src: unknown; path?: string | null; noCache?: boolean } | null;
}
interface NunjucksTemplate {
  rootRenderFunc: unknown;
  blocks: Record<string, unknown>;
  render(data: unknown, cb: (error: Error | null, result: string) => void): void;
}

/** Compiled template code (the object of root and block functions), by compile key. */
const compiled = new Map<string, unknown>();

/** Stops the table growing without bound in a long `serve` session where templates are edited. */
const MAX_COMPILED = 200;

let compiles = 0;

/** How many times a template was compiled in this process (for tests: table misses). */
export function nunjucksCompileCount(): number {
  return compiles;
}

function compileKey(str: string, path: string | null, env: NunjucksEnv): string {
  const extensions = env.extensionsList.map((e) => [e.__name ?? "", ...(e.tags ?? [])]);
  return JSON.stringify([path, env.asyncFilters, extensions, env.opts, str]);
}

/**
 * The compiled code of `str` (a template at `path`) for `env`: from the table when an earlier
 * environment compiled the same, else compiled now and kept. Null when it does not compile, so
 * that Nunjucks compiles it itself and reports the error as it always did.
 */
function compiledCode(lib: NunjucksLib, env: NunjucksEnv, str: string, path: string | null): unknown {
  const key = compileKey(str, path, env);
  let code = compiled.get(key);
  if (code === undefined) {
    try {
      compiles++;
      // Nunjucks compiles it (eagerly); its root and block functions are the code object a
      // Template accepts back ({ root, b_<name> }), so this module never evaluates code itself.
      const first = new lib.Template(str, env, path, true);
      code = { root: first.rootRenderFunc, ...Object.fromEntries(Object.entries(first.blocks).map(([name, fn]) => [`b_${name}`, fn])) };
    } catch {
      return null;
    }
    if (compiled.size >= MAX_COMPILED) compiled.clear();
    compiled.set(key, code);
  }
  return code;
}

/**
 * A Nunjucks Template for `str` whose compiled code comes from the table when an earlier
 * environment compiled the same; the same Template Eleventy's engine would make otherwise.
 */
function templateFor(lib: NunjucksLib, env: NunjucksEnv, str: string, path: string | null): NunjucksTemplate {
  const code = compiledCode(lib, env, str, path);
  // Let Nunjucks compile it when rendering, so the error reads as it always did.
  if (code === null) return new lib.Template(str, env, path, false);
  return new lib.Template({ type: "code", obj: code }, env, path, false);
}

/**
 * Makes the templates `env` loads itself (`import`, `from`, `include`, `extends`) take their
 * compiled code from the table too: each loader's source comes back as that code, which
 * Nunjucks' getTemplate turns into a Template as it does precompiled templates. Each Eleventy
 * pass has a new environment, whose loaders would otherwise compile every imported file again.
 */
function cacheLoadedTemplates(lib: NunjucksLib, env: NunjucksEnv): void {
  for (const loader of env.loaders ?? []) {
    // An asynchronous loader answers through a callback: left as it is.
    if (loader.async || typeof loader.getSource !== "function") continue;
    const getSource = loader.getSource.bind(loader);
    loader.getSource = (name: string) => {
      const info = getSource(name);
      if (info === null || typeof info !== "object" || typeof info.src !== "string") return info;
      const code = compiledCode(lib, env, info.src, info.path ?? null);
      return code === null ? info : { ...info, src: { type: "code", obj: code } };
    };
  }
}

/**
 * Makes `.njk` templates compile once (see the file comment). Output is unchanged: the same
 * environment renders the same compiled code. String permalinks are still rendered as templates.
 */
export function cacheNunjucksTemplates(eleventyConfig: UserConfig): void {
  let nunjucks: { lib: NunjucksLib; env: NunjucksEnv } | null = null;
  // Eleventy's own Nunjucks engine is made first (it announces its environment), then wrapped.
  eleventyConfig.on("eleventy.engine.njk", (event: { nunjucks: NunjucksLib; environment: NunjucksEnv }) => {
    nunjucks = { lib: event.nunjucks, env: event.environment };
    speedUpFrameSet(event.nunjucks.runtime);
    cacheLoadedTemplates(event.nunjucks, event.environment);
  });
  eleventyConfig.addExtension("njk", {
    compileOptions: { cache: false, permalink: true },
    compile(str: string, inputPath: string) {
      if (nunjucks === null) throw new Error("the Nunjucks environment was not announced (Eleventy changed?)");
      // As Eleventy's engine: no path for inline templates.
      const path = !inputPath || inputPath === "njk" || inputPath === "md" ? null : inputPath;
      const tmpl = templateFor(nunjucks.lib, nunjucks.env, str, path);
      return (data: unknown) =>
        new Promise<string>((resolve, reject) => {
          tmpl.render(data, (error, result) => (error ? reject(error) : resolve(result)));
        });
    },
  });
}
