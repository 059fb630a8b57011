/**
 * Minimal type shims for Eleventy 3 and its Vite plugin, which ship no declarations.
 * Only the members ohmbook calls are declared; widen them when you use more.
 */
declare module "@11ty/eleventy" {
  /** The configuration object handed to `.eleventy.js` and to `options.config`. */
  export interface UserConfig {
    addGlobalData(name: string, value: unknown): UserConfig;
    addPlugin(plugin: unknown, options?: unknown): void;
    addPassthroughCopy(path: string | Record<string, string>): UserConfig;
    addFilter(name: string, fn: (...args: any[]) => unknown): void;
    /** Called with each output's content before it is written; `this.page.outputPath` names it. */
    addTransform(name: string, fn: (this: { page?: { outputPath?: unknown } }, content: string) => string | Promise<string>): void;
    setNunjucksEnvironmentOptions(options: Record<string, unknown>): void;
    /** A custom template language, or an override of a built-in one (e.g. "njk"). */
    addExtension(extension: string, options: Record<string, unknown>): void;
    /** Listens to an Eleventy event (e.g. "eleventy.engine.njk" with the Nunjucks environment). */
    on(event: string, listener: (...args: any[]) => unknown): void;
    setQuietMode(quiet: boolean): void;
    setUseGitIgnore?(use: boolean): void;
    ignores: { add(glob: string): void };
    directories: { input: string; output: string; includes: string; data: string };
    [key: string]: unknown;
  }

  export interface EleventyOptions {
    configPath?: string;
    quietMode?: boolean;
    config?: (eleventyConfig: UserConfig) => void | Promise<void>;
    pathPrefix?: string;
  }

  /** Programmatic Eleventy: `new Eleventy(input, output, options).write()`. */
  export class Eleventy {
    constructor(input?: string, output?: string, options?: EleventyOptions);
    write(): Promise<unknown>;
    /** Silences all of Eleventy's console output (including plugin logs). */
    disableLogger(): void;
    toJSON(): Promise<Array<{ url: string; inputPath: string; outputPath: string; content: string }>>;
  }
  export default Eleventy;
}

declare module "@11ty/eleventy-plugin-vite" {
  export interface EleventyViteOptions {
    /** Folder Vite uses while it bundles; resolved against the process cwd unless absolute. */
    tempFolderName?: string;
    viteOptions?: Record<string, unknown>;
    serverOptions?: Record<string, unknown>;
  }
  const plugin: (eleventyConfig: unknown, options?: EleventyViteOptions) => void;
  export default plugin;
}
