/**
 * Minimal type shims for Nunjucks 3.2 (Eleventy's template engine), which ships no declarations.
 * Only what the tests call directly is declared; the site reaches Nunjucks through Eleventy.
 */
declare module "nunjucks" {
  export class Environment {
    constructor(loader: unknown, options?: { autoescape?: boolean });
    renderString(template: string, context: Record<string, unknown>): string;
  }
  /** Nunjucks' runtime module: Frame holds a template's variables, one per scope. */
  export const runtime: {
    Frame: {
      new (parent?: unknown, isolateWrites?: boolean): { variables: Record<string, unknown>; set(name: string, val: unknown, resolveUp?: boolean): void };
      prototype: { set(name: string, val: unknown, resolveUp?: boolean): void };
    };
  };
  /** Nunjucks' compiler module: template text to the source of its code. */
  export const compiler: { compile(...args: unknown[]): string };
  const nunjucks: { Environment: typeof Environment; runtime: typeof runtime; compiler: typeof compiler };
  export default nunjucks;
}
