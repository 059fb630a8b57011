/**
 * Property tests (fast-check) explore new random values on every local run and print the seed
 * of any failure. Under CI (CI=true) they run with one fixed seed, so a landing is judged on the
 * same values every time; FC_SEED overrides it to replay a failure seen elsewhere.
 */
import fc from "fast-check";

const seed = process.env.FC_SEED ?? (process.env.CI ? "20261202" : undefined);
if (seed !== undefined) fc.configureGlobal({ seed: Number(seed) });
