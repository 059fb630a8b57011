import { OhmbookError } from "../core/errors.ts";

/**
 * Raised by the pure modelling and cleaning primitives when their numeric input cannot
 * give a meaningful answer (too few points, mismatched lengths, singular design).
 * Callers in the pipeline catch it and turn it into a reported issue for the meter.
 */
export class ModelInputError extends OhmbookError {}
