import { OhmbookError } from "../core/errors.ts";

/**
 * Raised by the pure cleaning primitives when their input cannot give a meaningful answer
 * (window longer than the series, unknown time zone, ...). The pipeline reports it per meter.
 */
export class CleanInputError extends OhmbookError {}
