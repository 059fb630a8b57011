/**
 * Seeded uniforms in [0, 1) so row subsampling is reproducible: the same seed gives the same
 * model on every machine (the shared generator in src/core/random.ts).
 */
export { mulberry32 } from "../../core/random.ts";
