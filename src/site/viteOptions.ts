/**
 * Vite options of the site's client bundle, shared by the bundle's child process
 * (bundleChild.ts) and the test that builds a site through the Eleventy Vite plugin.
 */
import { createRequire } from "node:module";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { sameFolderAssetsPlugin } from "./sameFolderAssets.ts";

/** Project root (where package.json lives), independent of the process cwd. */
const PROJECT_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "..", "..");

/** Vite options of the site's client bundle (exported for the test that builds a site through the Eleventy Vite plugin too). */
export function viteOptions(verbose: boolean, onError: (error: Error) => void): Record<string, unknown> {
  const require = createRequire(join(PROJECT_ROOT, "package.json"));
  return {
    // When Vite fails, the Eleventy plugin's attempt to restore its folder can fail too and hide
    // the real cause; keep Vite's own error so the caller sees it.
    plugins: [
      {
        name: "ohmbook-keep-build-error",
        buildEnd(error?: Error) {
          if (error) onError(error);
        },
        renderError(error?: Error) {
          if (error) onError(error);
        },
      },
      // Pages opened from disk (file://) stay styled: no crossorigin on same-folder assets.
      sameFolderAssetsPlugin(),
    ],
    // Relative asset URLs: the site works under any path prefix and from a plain file server.
    base: "./",
    configFile: false,
    logLevel: verbose ? "info" : "silent",
    clearScreen: false,
    // Inline (empty) PostCSS config: Vite would otherwise search the output's parent folders
    // and could pick up an unrelated project's config.
    css: { postcss: {} },
    resolve: {
      // The scratch folder may sit outside the project, where bare imports would not resolve.
      // Object form: the plugin deep-merges its own object-form alias with ours.
      alias: { vega: require.resolve("vega"), "vega-interpreter": require.resolve("vega-interpreter") },
    },
    build: {
      emptyOutDir: true,
      // One shared bundle of the vega runtime is expected to be large; it is cached across pages.
      chunkSizeWarningLimit: 2000,
      reportCompressedSize: false,
    },
  };
}
